// A property-based corpus over the route handlers that read a query string, a body or an id (issue 16,
// the companion of action-corpus.test.ts): arbitrary query strings (the routes' own keys with
// hostile values, unknown keys, raw and badly escaped strings) and arbitrary bodies and content
// types never give a 500: a 2xx, or a 4xx whose JSON error names the field at fault. A body is read
// to its end (a streamed CSV must not fail half-way), and nothing is written: the school's rows
// are counted before and after each route's run.
import fc from "fast-check";
import { NextRequest } from "next/server";
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { actAs, closeDb, makeSchool } from "@/tests/helpers/factories";
import { makeBriefing } from "../mail/helpers";
import { GET as sessionsGET } from "@/app/api/sessions/route";
import { GET as briefingsGET } from "@/app/api/briefings/route";
import { GET as airframesGET } from "@/app/api/airframes/route";
import { GET as registerExportGET } from "@/app/api/register/export/route";
import { POST as rosterImportPOST } from "@/app/api/roster/import/route";
import { POST as handoutsPOST } from "@/app/api/briefings/[briefingId]/handouts/route";
import { POST as unsubscribePOST } from "@/app/api/unsubscribe/route";
import { GET as progressGET } from "@/app/api/progress/[studentId]/route";
import { GET as certificateGET } from "@/app/api/records/[studentId]/certificate/route";
import { GET as trainingRecordGET } from "@/app/api/records/[studentId]/training-record/route";
import { GET as logbookGET } from "@/app/api/ground-log/[studentId]/logbook/route";
import { GET as handoutGET } from "@/app/api/handouts/[handoutId]/route";
import { POST as unlockPOST } from "@/app/api/people/[personId]/unlock/route";
import { GET as directoryStudentsGET } from "@/app/api/directory/students/route";
import { GET as directoryCohortsGET } from "@/app/api/directory/cohorts/route";
import { GET as directoryInstructorsGET } from "@/app/api/directory/instructors/route";
import { GET as directoryPeopleGET } from "@/app/api/directory/people/route";
import { GET as directoryEndorsementsGET } from "@/app/api/directory/endorsements/route";
import {
  COHORT_PICKER_PURPOSES,
  ENDORSEMENT_PICKER_KINDS,
  INSTRUCTOR_PICKER_PURPOSES,
  PEOPLE_PICKER_ROLES,
  STUDENT_PICKER_PURPOSES,
} from "@/lib/directory/picker";

// Route handlers read the session cookie through next/headers, which has no request outside Next:
// here there is no cookie (the caller is set with actAs), so the Origin check of a cookie-carrying
// request does not apply; the e2e security tests cover it over HTTP.
jest.mock("next/headers", () => ({
  cookies: async () => ({ get: () => undefined, getAll: () => [], has: () => false }),
  headers: async () => new Headers(),
}));

jest.setTimeout(180_000);

type S = Awaited<ReturnType<typeof makeSchool>>;
let s: S;
let briefingId: string;

beforeAll(async () => {
  s = await makeSchool("route-corpus");
  briefingId = (await makeBriefing(s, "Route corpus briefing")).id;
});
afterAll(async () => {
  actAs(null);
  await closeDb();
});

const BASE = "http://127.0.0.1";
type Handler = (req: NextRequest, segment: { params: Promise<Record<string, string>> }) => Promise<Response>;

/** Values a query parameter may hold: hostile dates, numbers out of range, NUL, lone surrogates, text. */
const queryValue = fc.oneof(
  fc.string({ maxLength: 12 }),
  fc.string({ unit: "binary", maxLength: 8 }),
  fc.constantFrom(
    "",
    " ",
    "2026-02-30",
    "2026-13-01",
    "0000-01-01",
    "9999-12-31",
    "2026-12-01",
    "0",
    "-1",
    "1e9",
    "NaN",
    "a\u0000b",
    "\ud800",
    "%",
    "%zz",
  ),
  fc.uuid().map(String),
  fc.integer().map(String),
);

/** A query string: a dictionary of the route's keys (and others) or raw text after the "?". */
function queryFor(keys: string[], values: string[] = []): fc.Arbitrary<string> {
  const value = values.length ? fc.oneof(queryValue, fc.constantFrom(...values)) : queryValue;
  return fc.oneof(
    fc
      .dictionary(fc.oneof(fc.constantFrom(...keys), fc.string({ maxLength: 6 })), value, { maxKeys: 5 })
      .map((d) => new URLSearchParams(d).toString()),
    fc.string({ unit: "binary-ascii", maxLength: 40 }).map((raw) => raw.replace(/#/g, "")),
  );
}

/** The keys a query string carries, as the route will read them (for "the field named is one sent"). */
function sentKeys(query: string): string[] {
  try {
    return [...new URL(`${BASE}/x?${query}`).searchParams.keys()].filter(Boolean);
  } catch {
    return [];
  }
}

const CONTENT_TYPES = [
  "",
  "text/csv",
  "text/plain",
  "application/json",
  "application/octet-stream",
  "application/pdf",
  "image/png",
  "application/x-www-form-urlencoded",
  "multipart/form-data; boundary=x",
];

/** A body: JSON of any shape, text, or bytes, with a content type that may or may not fit. */
const bodyArb = fc.record({
  body: fc.oneof(
    fc.jsonValue().map((v) => Buffer.from(JSON.stringify(v) ?? "null")),
    fc.string({ maxLength: 200 }).map((t) => Buffer.from(t)),
    fc.uint8Array({ maxLength: 200 }).map((b) => Buffer.from(b)),
  ),
  contentType: fc.constantFrom(...CONTENT_TYPES),
});

async function check(res: Response, allowed: string[]): Promise<void> {
  expect(res.status).toBeLessThan(500);
  if (res.status < 400) {
    await res.arrayBuffer(); // read to the end: a stream that fails half-way rejects here
    return;
  }
  const body = (await res.json()) as { error?: { status?: number; message?: string; field?: string } };
  expect(body.error?.status).toBe(res.status);
  expect(typeof body.error?.field).toBe("string");
  // the field as named, or the top of a nested path ("lines.0.status"); a key sent may itself hold a dot
  const field = body.error!.field!;
  if (!allowed.includes(field)) expect(allowed).toContain(field.split(".")[0]);
  expect(body.error?.message).toMatch(/\S/);
}

async function rowCounts(): Promise<Record<string, number>> {
  const [r] = await sequelize.query<Record<string, number>>(
    `SELECT (SELECT count(*)::int FROM people WHERE school_id = :s) AS people,
            (SELECT count(*)::int FROM enrolments e JOIN people p ON p.id = e.student_id WHERE p.school_id = :s) AS enrolments,
            (SELECT count(*)::int FROM cohort_memberships m JOIN people p ON p.id = m.student_id WHERE p.school_id = :s) AS memberships,
            (SELECT count(*)::int FROM handouts h JOIN briefings b ON b.id = h.briefing_id WHERE b.school_id = :s) AS handouts,
            (SELECT count(*)::int FROM mail_unsubscribes) AS unsubscribes,
            (SELECT count(*)::int FROM outbox WHERE school_id = :s) AS outbox,
            (SELECT count(*)::int FROM audit_events WHERE school_id = :s) AS audit`,
    { replacements: { s: s.school.id }, type: QueryTypes.SELECT },
  );
  return r!;
}

const noParams = { params: Promise.resolve({}) };

interface QueryRoute {
  name: string;
  handler: Handler;
  keys: string[];
  /** values the route accepts for a key (a purpose, a kind), so the hostile text also reaches a valid query */
  values?: readonly string[];
}

const QUERY_ROUTES: QueryRoute[] = [
  {
    name: "GET /api/sessions",
    handler: sessionsGET as Handler,
    keys: ["from", "to", "instructor", "cohort", "room", "mine", "status", "sort", "dir", "page", "pageSize"],
  },
  { name: "GET /api/briefings", handler: briefingsGET as Handler, keys: ["q", "item", "sort", "dir", "page"] },
  { name: "GET /api/airframes", handler: airframesGET as Handler, keys: ["retired"] },
  {
    name: "GET /api/register/export",
    handler: registerExportGET as Handler,
    keys: ["instructor", "cohort", "stage", "from", "to", "page"],
  },
  // the search pickers: a purpose (or role, or kind) chosen from a list and the text typed
  {
    name: "GET /api/directory/students",
    handler: directoryStudentsGET as Handler,
    keys: ["q", "purpose"],
    values: STUDENT_PICKER_PURPOSES,
  },
  { name: "GET /api/directory/cohorts", handler: directoryCohortsGET as Handler, keys: ["q", "purpose"], values: COHORT_PICKER_PURPOSES },
  {
    name: "GET /api/directory/instructors",
    handler: directoryInstructorsGET as Handler,
    keys: ["q", "purpose"],
    values: INSTRUCTOR_PICKER_PURPOSES,
  },
  { name: "GET /api/directory/people", handler: directoryPeopleGET as Handler, keys: ["q", "role"], values: PEOPLE_PICKER_ROLES },
  {
    name: "GET /api/directory/endorsements",
    handler: directoryEndorsementsGET as Handler,
    keys: ["q", "kind"],
    values: ENDORSEMENT_PICKER_KINDS,
  },
];

describe.each(QUERY_ROUTES)("$name", ({ handler, keys, values }) => {
  it("answers any query string with a 2xx or a 4xx naming a field, and writes nothing", async () => {
    actAs(s.as.chief);
    const before = await rowCounts();
    await fc.assert(
      fc.asyncProperty(queryFor(keys, [...(values ?? [])]), async (query) => {
        const res = await handler(new NextRequest(`${BASE}/api/x?${query}`), noParams);
        // a zod error on the whole query names "body", a nameless parameter "query"; else the route's own keys or a key it was sent
        await check(res, [...keys, ...sentKeys(query), "body", "query"]);
      }),
      { numRuns: 60 },
    );
    expect(await rowCounts()).toEqual(before);
  });
});

describe("POST /api/roster/import", () => {
  it("answers any mode and body with a 2xx (a preview) or a 4xx naming a field, and imports nothing", async () => {
    actAs(s.as.chief);
    const before = await rowCounts();
    await fc.assert(
      fc.asyncProperty(queryFor(["mode"]), bodyArb, async (query, { body, contentType }) => {
        const req = new NextRequest(`${BASE}/api/roster/import?${query}`, {
          method: "POST",
          body,
          headers: contentType ? { "content-type": contentType } : {},
        });
        await check(await rosterImportPOST(req, noParams), ["mode", "file", "body", ...sentKeys(query)]);
      }),
      { numRuns: 60 },
    );
    expect(await rowCounts()).toEqual(before);
  });
});

describe("POST /api/briefings/[briefingId]/handouts", () => {
  it("answers any id, name and body with a 4xx naming a field, and stores no handout", async () => {
    actAs(s.as.chief);
    const before = await rowCounts();
    const idArb = fc.oneof(fc.constant(briefingId), fc.uuid().map(String), fc.string({ maxLength: 40 }));
    await fc.assert(
      fc.asyncProperty(idArb, queryFor(["name"]), bodyArb, async (id, query, { body, contentType }) => {
        const req = new NextRequest(`${BASE}/api/briefings/x/handouts?${query}`, {
          method: "POST",
          body,
          headers: contentType ? { "content-type": contentType } : {},
        });
        const res = await handoutsPOST(req, { params: Promise.resolve({ briefingId: id }) });
        expect(res.status).toBeGreaterThanOrEqual(400); // no generated body is a real PDF, PNG or JPEG
        await check(res, ["briefingId", "name", "file", "body", ...sentKeys(query)]);
      }),
      { numRuns: 60 },
    );
    expect(await rowCounts()).toEqual(before);
  });
});

describe("POST /api/unsubscribe", () => {
  it("answers any token in the query or a form with a 4xx naming the token, and records no unsubscription", async () => {
    actAs(null); // public: the signed token is the credential
    const before = await rowCounts();
    await fc.assert(
      fc.asyncProperty(queryFor(["token"]), bodyArb, async (query, { body, contentType }) => {
        const req = new NextRequest(`${BASE}/api/unsubscribe?${query}`, {
          method: "POST",
          body,
          headers: contentType ? { "content-type": contentType } : {},
        });
        const res = await unsubscribePOST(req);
        expect(res.status).toBeGreaterThanOrEqual(400); // no generated token carries a valid signature
        await check(res, ["token"]);
      }),
      { numRuns: 60 },
    );
    expect(await rowCounts()).toEqual(before);
  });
});

// The routes that read only an id from the path: any string there (ids of nothing, of another
// school, text, escapes) is a 4xx naming the id, never a 500, and writes nothing.
const PARAM_ROUTES: { name: string; handler: Handler; param: string }[] = [
  { name: "GET /api/progress/[studentId]", handler: progressGET as Handler, param: "studentId" },
  { name: "GET /api/records/[studentId]/certificate", handler: certificateGET as Handler, param: "studentId" },
  { name: "GET /api/records/[studentId]/training-record", handler: trainingRecordGET as Handler, param: "studentId" },
  { name: "GET /api/ground-log/[studentId]/logbook", handler: logbookGET as Handler, param: "studentId" },
  { name: "GET /api/handouts/[handoutId]", handler: handoutGET as Handler, param: "handoutId" },
  { name: "POST /api/people/[personId]/unlock", handler: unlockPOST as Handler, param: "personId" },
];

describe.each(PARAM_ROUTES)("$name", ({ handler, param }) => {
  it("answers any id in the path with a 4xx naming it, and writes nothing", async () => {
    actAs(s.as.chief);
    const before = await rowCounts();
    const idArb = fc.oneof(
      fc.uuid().map(String),
      fc.string({ maxLength: 40 }),
      fc.string({ unit: "binary", maxLength: 12 }),
      fc.constantFrom("", "..", "%00", "null"),
    );
    await fc.assert(
      fc.asyncProperty(idArb, async (id) => {
        const req = new NextRequest(`${BASE}/api/x`, { method: handler === (unlockPOST as Handler) ? "POST" : "GET" });
        const res = await handler(req, { params: Promise.resolve({ [param]: id }) });
        expect(res.status).toBeGreaterThanOrEqual(400); // no generated id names a record of this school
        await check(res, [param]);
      }),
      { numRuns: 40 },
    );
    expect(await rowCounts()).toEqual(before);
  });
});
