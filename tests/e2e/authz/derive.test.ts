// The endpoint derivation itself: how route files, app-dir paths and dynamic segments are read.
// (The harness's list is only as good as this parser.)
import { appPath, exportedMethods, fillPath, deriveRoutes } from "./derive";

describe("exportedMethods reads every way a route file exports a method", () => {
  test.each([
    ["export const GET = route(...)", ["GET"]],
    ["export async function POST(req) {}", ["POST"]],
    ["export function DELETE() {}", ["DELETE"]],
    ["const handler = NextAuth(o);\nexport { handler as GET, handler as POST };", ["GET", "POST"]],
    ["async function PUT() {}\nexport { PUT }", ["PUT"]],
    ["export const dynamic = 'force-dynamic';\nexport const revalidate = 0;", []],
    ["// export const GET = x\n/* export async function POST() {} */\nexport const PATCH = y", ["PATCH"]],
    ["export const GETTER = 1; export function POSTAL() {}", []],
  ])("%j → %j", (src, want) => {
    expect(exportedMethods(src)).toEqual(want);
  });
});

test("appPath drops route groups and parallel slots, keeps dynamic segments", () => {
  expect(appPath("app/api/today/route.ts")).toBe("/api/today");
  expect(appPath("app/(app)/x/[id]/route.ts")).toBe("/x/[id]");
  expect(appPath("app/@modal/(group)/y/[...rest]/route.ts")).toBe("/y/[...rest]");
  expect(appPath("app/(app)/today/page.tsx")).toBe("/today");
});

test("fillPath fills dynamic and catch-all segments, and names a missing one", () => {
  expect(fillPath("/api/people/[personId]/unlock", { personId: "abc" })).toBe("/api/people/abc/unlock");
  expect(fillPath("/files/[...path]", { path: "a b/c" })).toBe("/files/a%20b/c");
  expect(() => fillPath("/api/people/[personId]/unlock", {})).toThrow(/\[personId\]/);
});

test("deriveRoutes finds the foundation's route files in this checkout", () => {
  const keys = deriveRoutes().map((r) => r.key);
  expect(keys).toEqual(
    expect.arrayContaining([
      "GET /api/health",
      "GET /api/today",
      "GET /api/auth/[...nextauth]",
      "POST /api/auth/[...nextauth]",
      "POST /api/people/[personId]/unlock",
    ]),
  );
});

test("fillPath uses the fallback only for segments not given", () => {
  expect(fillPath("/records/[studentId]/[x]", { x: "1" }, "ph")).toBe("/records/ph/1");
});
