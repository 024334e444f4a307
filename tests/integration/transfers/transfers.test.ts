import { NextRequest } from "next/server";
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { makeSchool, closeDb, actAs } from "@/tests/helpers/factories";
import { POST as creditRoute } from "@/app/api/transfers/credits/route";
import { GET as evidenceRoute } from "@/app/api/transfers/credits/[creditId]/evidence/route";
import { creditedMinutesFor, groundHoursFor } from "@/db/access/ground-log/ground-hours";
import { progressFor } from "@/db/access/records/progress-map";
import { trainingRecordFor } from "@/db/access/records/training-record";
import { itemsOfRevision } from "@/db/access/records/items";
import type { CurrentUser } from "@/lib/auth/session";
import { auditCount, type School } from "../records/helpers";

// Transfers in (issue 13): credit from an earlier school is capped by the server at 50% of the
// course's ground training minimum when the earlier course was approved and 25% otherwise
// (14 CFR 141.77(c)(1) and (c)(2)); refusals name the field and write nothing; the evidence file is
// a PDF, PNG or JPEG up to 10 MB; the credit counts in every ground-hours total and its items show
// as credited by transfer.

// Route handlers read the session cookie through next/headers, which has no request outside Next:
// here there is no cookie (the caller is set with actAs), so the Origin check does not apply; the
// e2e authorisation harness calls the route over HTTP.
jest.mock("next/headers", () => ({
  cookies: async () => ({ get: () => undefined, getAll: () => [], has: () => false }),
  headers: async () => new Headers(),
}));

let s: School;
let other: School;
// the test school's course minimum is 35 h = 2100 min: 50% = 1050, 25% = 525 (141.77(c))
const MINIMUM = 35 * 60;

/** A valid 1×1 grey PNG (RFC 2083). */
const PNG = Buffer.from(
  "89504e470d0a1a0a0000000d49484452000000010000000108000000003a7e9b55" +
    "0000000a49444154789c636800000082008177cd72b60000000049454e44ae426082",
  "hex",
);
const PDF = Buffer.from("%PDF-1.4\n1 0 obj<<>>endobj\ntrailer<<>>\n%%EOF\n");

type Fields = Record<string, string | string[]>;
function form(fields: Fields, file: { bytes: Buffer; name: string; type?: string } | null = { bytes: PDF, name: "earlier-school.pdf" }) {
  const f = new FormData();
  for (const [k, v] of Object.entries(fields)) for (const x of Array.isArray(v) ? v : [v]) f.append(k, x);
  if (file) f.append("evidence", new Blob([new Uint8Array(file.bytes)], { type: file.type ?? "application/octet-stream" }), file.name);
  return f;
}

function base(studentId: string, over: Fields = {}): Fields {
  return {
    studentId,
    sourceSchool: "Fenwick Moor Aero Club",
    sourceApproved: "yes",
    creditedMinutes: "600",
    testKind: "knowledge",
    testTakenOn: "2026-09-02",
    testResult: "Passed, 86%",
    ...over,
  };
}

async function post(user: CurrentUser | null, body: FormData | string, headers: Record<string, string> = {}) {
  actAs(user);
  const res = await creditRoute(new NextRequest("http://127.0.0.1/api/transfers/credits", { method: "POST", body, headers }), {
    params: Promise.resolve({}),
  });
  return { status: res.status, json: (await res.json()) as { creditId?: string; error?: { message: string; field?: string } } };
}

async function credits(studentId: string) {
  const [r] = await sequelize.query<{ n: number; items: number }>(
    `SELECT count(*)::int AS n, (SELECT count(*)::int FROM transfer_credit_items ci JOIN transfer_credits c ON c.id = ci.credit_id WHERE c.student_id = :s) AS items
       FROM transfer_credits WHERE student_id = :s`,
    { replacements: { s: studentId }, type: QueryTypes.SELECT },
  );
  return r!;
}

beforeAll(async () => {
  s = await makeSchool("xfer");
  other = await makeSchool("xfer-other");
}, 60_000);
afterAll(async () => {
  actAs(null);
  await closeDb();
});

describe("caps (14 CFR 141.77(c))", () => {
  it("accepts exactly 50% from an approved course and refuses one minute more, naming the field and the cap", async () => {
    const st = s.people.students[0]!.id;
    const audits = await auditCount(s.school.id, "transfer.credit");
    const ok = await post(s.as.chief, form(base(st, { creditedMinutes: String(MINIMUM / 2) })));
    expect(ok.status).toBe(201);
    expect(await credits(st)).toEqual({ n: 1, items: 0 });
    const over = await post(s.as.chief, form(base(st, { creditedMinutes: "1" })));
    expect(over.status).toBe(422);
    expect(over.json.error?.field).toBe("creditedMinutes");
    expect(over.json.error?.message).toMatch(/at most 1050 minutes .*50%.*1050 already credited, 0 left.*141\.77\(c\)/);
    expect(await credits(st)).toEqual({ n: 1, items: 0 });
    expect(await auditCount(s.school.id, "transfer.credit")).toBe(audits + 1);
  });

  it("refuses 25% + 1 minute from a course that was not approved and accepts exactly 25%", async () => {
    const st = s.people.students[1]!.id;
    const over = await post(s.as.chief, form(base(st, { sourceApproved: "no", creditedMinutes: String(MINIMUM / 4 + 1) })));
    expect(over.status).toBe(422);
    expect(over.json.error).toMatchObject({ field: "creditedMinutes" });
    expect(over.json.error?.message).toMatch(/at most 525 minutes can be credited from a course that was not approved, 25%/);
    expect((await credits(st)).n).toBe(0);
    const ok = await post(s.as.chief, form(base(st, { sourceApproved: "no", creditedMinutes: String(MINIMUM / 4) })));
    expect(ok.status).toBe(201);
    expect(await creditedMinutesFor(st, s.course.id)).toBe(MINIMUM / 4);
  });

  it("writes nothing when a credit with items is refused (no partial write)", async () => {
    const st = s.people.students[2]!.id;
    const items = (await itemsOfRevision(s.revision.id)).slice(0, 2).map((i) => i.id);
    const before = await auditCount(s.school.id, "transfer.credit");
    const r = await post(s.as.chief, form(base(st, { creditedMinutes: String(MINIMUM / 2 + 1), itemIds: items })));
    expect(r.status).toBe(422);
    expect(await credits(st)).toEqual({ n: 0, items: 0 });
    expect(await auditCount(s.school.id, "transfer.credit")).toBe(before);
  });

  it("refuses an item outside the student's syllabus and a test dated after today, naming each field", async () => {
    const st = s.people.students[2]!.id;
    const foreign = (await itemsOfRevision(other.revision.id))[0]!.id;
    const bad = await post(s.as.chief, form(base(st, { itemIds: [foreign] })));
    expect(bad).toMatchObject({ status: 400, json: { error: { field: "itemIds" } } });
    const later = await post(s.as.chief, form(base(st, { testTakenOn: "2099-01-01" })));
    expect(later).toMatchObject({ status: 400, json: { error: { field: "testTakenOn" } } });
    const missing = await post(s.as.chief, form(base(st, { sourceSchool: "" })));
    expect(missing).toMatchObject({ status: 400, json: { error: { field: "sourceSchool" } } });
    expect((await credits(st)).n).toBe(0);
  });
});

describe("evidence upload", () => {
  const st = () => s.people.students[3]!.id;
  it("refuses a missing, empty, unknown-type, misnamed or oversized file, naming the evidence field", async () => {
    const cases: [FormData, number, RegExp][] = [
      [form(base(st()), null), 400, /attach the evidence/],
      [form(base(st()), { bytes: Buffer.alloc(0), name: "empty.pdf" }), 400, /empty/],
      [form(base(st()), { bytes: Buffer.from("just some words"), name: "notes.txt" }), 415, /only PDF, PNG and JPEG/],
      [form(base(st()), { bytes: PNG, name: "scan.pdf" }), 415, /does not match its content \(image\/png\)/],
      [form(base(st()), { bytes: Buffer.concat([PDF, Buffer.alloc(10 * 1024 * 1024)]), name: "big.pdf" }), 413, /10 MB limit/],
    ];
    for (const [body, status, message] of cases) {
      const r = await post(s.as.chief, body);
      expect(r.status).toBe(status);
      expect(r.json.error?.field).toBe("evidence");
      expect(r.json.error?.message).toMatch(message);
    }
    const notForm = await post(s.as.chief, JSON.stringify(base(st())), { "content-type": "application/json" });
    expect(notForm).toMatchObject({ status: 415, json: { error: { field: "body" } } });
    expect((await credits(st())).n).toBe(0);
  });

  it("stores the file, hands it back to the chief as an attachment, and to no other school", async () => {
    const r = await post(s.as.chief, form(base(st(), { creditedMinutes: "60" }), { bytes: PNG, name: "transcript.png" }));
    expect(r.status).toBe(201);
    const get = async (user: CurrentUser, id: string) => {
      actAs(user);
      return evidenceRoute(new NextRequest(`http://127.0.0.1/api/transfers/credits/${id}/evidence`), {
        params: Promise.resolve({ creditId: id }),
      });
    };
    const res = await get(s.as.chief, r.json.creditId!);
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("image/png");
    expect(Buffer.from(await res.arrayBuffer()).equals(PNG)).toBe(true);
    expect((await get(other.as.chief, r.json.creditId!)).status).toBe(404);
    expect((await get(s.as.instructor, r.json.creditId!)).status).toBe(403);
  });
});

describe("permissions", () => {
  it("refuses instructors, students, sponsors and the signed-out, and a student of another school", async () => {
    const st = s.people.students[4]!.id;
    for (const [user, status] of [
      [s.as.instructor, 403],
      [s.as.student, 403],
      [s.as.sponsor, 403],
      [null, 401],
    ] as const) {
      expect((await post(user, form(base(st)))).status).toBe(status);
    }
    expect((await post(other.as.chief, form(base(st)))).status).toBe(404);
    expect((await credits(st)).n).toBe(0);
  });
});

describe("the credit in the record", () => {
  it("counts in every ground-hours total and shows its items as credited by transfer", async () => {
    const st = s.people.students[5]!.id;
    const items = (await itemsOfRevision(s.revision.id)).slice(0, 2);
    const r = await post(
      s.as.chief,
      form(base(st, { creditedMinutes: "300", itemIds: items.map((i) => i.id), idempotencyKey: "xfer-key-0001" })),
    );
    expect(r.status).toBe(201);
    // a retried submit of the same form returns the first credit
    const again = await post(
      s.as.chief,
      form(base(st, { creditedMinutes: "300", itemIds: items.map((i) => i.id), idempotencyKey: "xfer-key-0001" })),
    );
    expect(again).toMatchObject({ status: 200, json: { creditId: r.json.creditId } });
    expect(await credits(st)).toEqual({ n: 1, items: 2 });

    expect(await creditedMinutesFor(st, s.course.id)).toBe(300);
    const hours = (await groundHoursFor(st, s.course.id))!;
    expect(hours).toMatchObject({ creditedMinutes: 300, transferMinutes: 300 });
    expect(hours.byStage.reduce((a, x) => a + x.minutes, 0)).toBe(hours.creditedMinutes);
    expect(hours.byStage).toContainEqual({ stageCode: null, stageTitle: "Credited by transfer", minutes: 300 });

    const chief = s.as.chief;
    const map = await progressFor(chief, st);
    expect(map.ground?.minutes).toBe(300);
    const mapItems = map.stages.flatMap((x) => x.items);
    expect(mapItems.find((i) => i.id === items[0]!.id)?.transferCredit).toEqual({
      sourceSchool: "Fenwick Moor Aero Club",
      on: "2026-09-02",
    });
    expect(mapItems.filter((i) => i.transferCredit).length).toBe(2);

    const record = await trainingRecordFor(chief, st);
    expect(record.groundMinutes).toBe(300);
    expect(record.groundLog.reduce((a, g) => a + g.minutes, 0)).toBe(record.groundMinutes);
    expect(record.groundLog).toContainEqual(expect.objectContaining({ status: "credited_by_transfer", minutes: 300 }));
    expect(record.notYetDone.find((i) => i.code === items[0]!.code)?.title).toMatch(/credited by transfer from Fenwick Moor Aero Club/);

    // an item credited twice is refused, naming it
    const twice = await post(chief, form(base(st, { creditedMinutes: "10", itemIds: [items[0]!.id] })));
    expect(twice).toMatchObject({ status: 422, json: { error: { field: "itemIds" } } });
    expect(twice.json.error?.message).toContain(items[0]!.code);
  });

  it("is append-only: the database refuses to change or delete a credit", async () => {
    await expect(
      sequelize.query(`UPDATE transfer_credits SET credited_minutes = 0 WHERE school_id = :s`, { replacements: { s: s.school.id } }),
    ).rejects.toThrow(/append-only|permission denied/);
    await expect(
      sequelize.query(`DELETE FROM transfer_credits WHERE school_id = :s`, { replacements: { s: s.school.id } }),
    ).rejects.toThrow(/append-only|permission denied/);
  });
});
