import { safeNextPath } from "@/lib/validation/next-path";

describe("safeNextPath", () => {
  test.each(["/today", "/records/abc?tab=checks", "/timetable#week", "/progress/0a1b"])("keeps the same-site path %s", (p) => {
    expect(safeNextPath(p)).toBe(p);
  });
  test.each([
    "/\\evil.example/x",
    "//evil.example/x",
    "/\t/evil.example/x",
    "/\n/evil.example",
    "https://evil.example/x",
    "javascript:alert(1)",
    "evil.example",
    "",
    "\\\\evil.example",
    "/%5Cevil.example/x".replace("%5C", "\\"),
  ])("refuses %p and falls back to /today", (p) => {
    expect(safeNextPath(p)).toBe("/today");
  });
  test("refuses what is not a string, with the given fallback", () => {
    expect(safeNextPath(["/today", "//evil"], "/")).toBe("/");
    expect(safeNextPath(undefined)).toBe("/today");
  });
  test("a path that normalises to //host is refused", () => {
    expect(safeNextPath("/./..//evil.example")).toBe("/today");
  });
});
