jest.mock("next/cache", () => ({ revalidatePath: jest.fn() }));
import { execFileSync } from "node:child_process";
import { createHash } from "node:crypto";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { NextRequest } from "next/server";
import { addMonths, addYears, format, parseISO } from "date-fns";
import { sequelize } from "@/db/index";
import { makeSchool, closeDb, actAs, TEST_PASSWORD } from "@/tests/helpers/factories";
import { changeQualification } from "@/tests/helpers/qualifications";
import { GET as inspectionPackRoute } from "@/app/api/records/[studentId]/inspection-pack/route";
import { itemsOfRevision } from "@/db/access/records/items";
import { chainHead } from "@/db/access/records/audit-chain";
import { scheduleSession } from "@/db/access/timetable/schedule-session";
import { recordAttendance } from "@/db/access/ground-log/record-attendance";
import { endorse } from "@/db/access/endorsements/endorse";
import { recordResult } from "@/db/access/endorsements/results";
import { saveTransferCredit } from "@/db/access/transfers/record-credit";
import { setLegalHold } from "@/db/access/retention/holds";
import { transferCreditSchema } from "@/lib/transfers/schema";
import { inspectionPackFor } from "@/db/access/inspection/inspection-pack";
import { packDocument } from "@/lib/inspection/content";
import { scheduleSessionSchema, recordAttendanceSchema } from "@/lib/timetable/schema";
import { CAUTION_TEXT } from "@/lib/caution";
import { setClock, resetClock } from "@/lib/clock";
import { dateInZone, formatDay, formatDayTime } from "@/lib/time";
import type { School } from "../records/helpers";
import { makeBriefing, addRooms } from "../timetable/helpers";
import { completeCourse, endTrainingToday, statement } from "../completion/helpers";

// The inspection pack (issue 13): one PDF for a student an inspector chooses, made by the chief
// instructor. Its text (pdftotext, Debian's poppler-utils, installed by ensure_poppler in
// lib/ops/common.sh) must hold every required item; other callers are refused.

let s: School;
let other: School;
let graduate: string;
const TZ = "Europe/London";

/** An audit event about someone else (the chain trigger links it): the school's chain moves on. */
async function auditAnotherStudent() {
  await sequelize.query(
    `INSERT INTO audit_events (school_id, actor_id, actor_roles, action, record_type, record_id, after, occurred_at, chain_pos, prev_hash, hash, seq)
     VALUES (:s, :actor, '{chief}', 'test.elsewhere', 'test', gen_random_uuid(), '{}'::jsonb, now(), 0, '', '', 0)`,
    { replacements: { s: s.school.id, actor: s.people.chief.id } },
  );
}
const today = () => dateInZone(new Date(), TZ);
const daysAgo = (n: number) => dateInZone(new Date(Date.now() - n * 86_400_000), TZ);
const QUESTION = "Why does induced drag fall as speed rises";
const EVIDENCE = Buffer.from("%PDF-1.4\n% evidence of the earlier school's record\n%%EOF\n");

beforeAll(async () => {
  s = await makeSchool("insp");
  other = await makeSchool("insp-other");
  graduate = s.people.students[0]!.id;
  await sequelize.query(
    `UPDATE schools SET settings = settings || '{"schoolCertificateNumber":"LHS-7702"}'::jsonb WHERE id = :id;
     UPDATE courses SET min_ground_minutes = 180 WHERE id = :course`,
    { replacements: { id: s.school.id, course: s.course.id } },
  );

  // a ground session taught by Instructor One, attended by the student (90 minutes credited)
  await addRooms(s, ["Hangar classroom"]);
  const briefing = await makeBriefing(s, "Drag curves and the minimum-drag speed", ["AER-01", "AER-02"]);
  const session = await sequelize.transaction((t) =>
    scheduleSession(
      s.as.instructor,
      scheduleSessionSchema.parse({
        briefingId: briefing.id,
        date: daysAgo(3),
        time: "09:00",
        durationMinutes: 90,
        room: "Hangar classroom",
        instructorId: s.people.instructor.id,
        cohortId: s.cohorts.a.id,
      }),
      t,
    ),
  );
  await sequelize.transaction((t) =>
    recordAttendance(
      s.as.instructor,
      recordAttendanceSchema.parse({ sessionId: session.id, lines: [{ studentId: graduate, status: "attended" }] }),
      t,
    ),
  );

  // credit from an earlier approved course: 90 min, the cap being 50 % of the 3 h minimum (14 CFR 141.77(c)(1))
  await saveTransferCredit(
    s.as.chief,
    transferCreditSchema.parse({
      studentId: graduate,
      sourceSchool: "Eastmere Aero Club (fictional)",
      sourceApproved: "yes",
      creditedMinutes: 90,
      itemIds: [],
      testKind: "knowledge",
      testTakenOn: daysAgo(10),
      testResult: "84 %",
    }),
    { fileName: "eastmere-record.pdf", contentType: "application/pdf", bytes: EVIDENCE },
  );

  // every item checked (Instructor One) and signed, every stage check passed (the chief examines)
  await completeCourse(s, graduate, { checkOf: (i) => (i.code === "AER-01" ? { question: { questionText: QUESTION } } : {}) });

  // endorsed for the knowledge test by Instructor One, passed at 88 %
  const e = await sequelize.transaction((t) =>
    endorse(t, s.as.instructor, { studentId: graduate, password: TEST_PASSWORD, endorsedOn: undefined }),
  );
  await sequelize.transaction((t) =>
    recordResult(t, s.as.instructor, { endorsementId: e.endorsementId, takenOn: today(), scorePercent: 88, areasMissed: [] }),
  );

  // Instructor One's recency renewed today: a second version in the instructor file
  await changeQualification(s.people.instructor.id, { recencyOn: today() }, today());

  // graduated, the record certified by the chief
  actAs(s.as.chief);
  const r = await endTrainingToday({ studentId: graduate, kind: "graduated", reason: "all stages passed" });
  if (!r.ok) throw new Error(r.message);
  await sequelize.transaction((t) => setLegalHold(t, s.as.chief, { studentId: graduate, reason: "Inspection by the authority" }));
}, 180_000);

afterAll(async () => {
  actAs(null);
  resetClock();
  await closeDb();
});

const req = (studentId: string) =>
  [new NextRequest(`http://127.0.0.1/api/records/${studentId}/inspection-pack`), { params: Promise.resolve({ studentId }) }] as const;

/** The PDF's text per page (pdftotext separates pages with a form feed), whitespace collapsed. */
async function pdfPages(res: Response): Promise<string[]> {
  const dir = mkdtempSync(path.join(tmpdir(), "insp-"));
  try {
    const file = path.join(dir, "pack.pdf");
    writeFileSync(file, Buffer.from(await res.arrayBuffer()));
    // pdftotext: Debian's poppler-utils, installed by ensure_poppler in lib/ops/common.sh
    const text = execFileSync("pdftotext", ["-enc", "UTF-8", file, "-"], { encoding: "utf8" });
    return text
      .split("\f")
      .map((p) => p.replace(/\s+/g, " ").trim())
      .filter((p) => p.length > 0);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

describe("the inspection pack", () => {
  it("holds every required item, with page x of y, the time made, the record hash and the caution on every page", async () => {
    actAs(s.as.chief);
    const madeAt = new Date(Math.floor(Date.now() / 1000) * 1000);
    setClock(() => madeAt);
    const res = await inspectionPackRoute(...req(graduate));
    resetClock();
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toBe("application/pdf");
    const hash = res.headers.get("x-record-hash")!;
    expect(hash).toMatch(/^[0-9a-f]{64}$/);
    const pages = await pdfPages(res);
    const text = pages.join(" ");
    const head = await chainHead(s.school.id);
    const code = s.course.code;
    const made = formatDayTime(madeAt, TZ, { seconds: true });

    for (const needed of [
      // enrolment and syllabus revision
      "Inspection pack: Student 1",
      `${s.school.name} (certificate LHS-7702)`,
      `Course: ${code} Test ground course`,
      `Enrolled on ${formatDay("2026-08-30")}`,
      `Training ended on ${formatDay(today())}: Graduated (all stages passed)`,
      `Revision 1 of ${code}: approved ${formatDay("2026-01-01")}, effective from ${formatDay("2026-01-01")}`,
      // transfer-in credit, then the ground log line with its hours (90 min session + 90 min credit = 3 h of the 3 h minimum)
      "Eastmere Aero Club (fictional) (approved course): 1.5 h credited of a cap of 1.5 h (14 CFR 141.77(c))",
      `Test given by this school: Knowledge, taken on ${formatDay(daysAgo(10))}: 84 %`,
      `Evidence SHA-256 ${createHash("sha256").update(EVIDENCE).digest("hex")}`,
      "Credited ground time: 3 of 3 h (including transfer-in credit)",
      `${formatDay(daysAgo(3))} Drag curves and the minimum-drag speed Instructor One Attended 1.5 h`,
      // oral check items with their grades
      `[AER-01] ${QUESTION} - Solid`,
      "[ATM-02] Explain it - Solid",
      "Meets the standard · level of learning shown: Correlation",
      // sign-offs and stage checks
      "AER-01",
      "Passed",
      // endorsement and result
      `Attempt 1: endorsed on ${formatDay(today())} by Instructor One`,
      `Result: taken on ${formatDay(today())}, score 88 % (pass mark 70 %): Passed, valid until`,
      // certification (record_certifications)
      `Graduation: certified on ${formatDay(today())} by Chief`,
      statement,
      // retention: 3 years from the end of training (14 CFR 61.189(c), the longest of the school's default rules), on hold
      `Kept until ${formatDay(format(addYears(parseISO(today()), 3), "yyyy-MM-dd"))}: ${formatDay(today())}, the end of training, plus the longest rule that applies (14 CFR 61.189(c), 3 years)`,
      `Legal hold since ${formatDay(today())} (Chief): Inspection by the authority`,
      // the audit chain's verification and head
      `Verified: all ${head.position} events of the school's chain link up`,
      `Head hash ${head.hash}`,
      // instructor files: qualification history, recency, briefings taught
      "Instructor One (checked, endorsed, signed, taught)",
      `GI-${s.people.instructor.id.slice(0, 6)}`,
      "changed by a test",
      // recency renewed today for 24 months (the factory's period)
      `current, recency runs out on ${formatDay(format(addMonths(parseISO(today()), 24), "yyyy-MM-dd"))}`,
      "Briefings taught: Drag curves and the minimum-drag speed (1 session",
      "Chief (certified, examined)",
      // the pass-rate report: one first attempt, passed
      `${code} Test ground course 1 1 100 %`,
      // made at, record hash and what it covers
      `Made on ${made} (${TZ}) by Chief`,
      `Record hash (SHA-256): ${hash}`,
      "The record hash is SHA-256 over this pack's content as printed",
    ])
      expect(text).toContain(needed);

    // stage checks: one row per stage of the demo syllabus, each passed
    const stages = [...new Set((await itemsOfRevision(s.revision.id)).map((i) => i.stageCode))];
    for (const st of stages) expect(text).toMatch(new RegExp(`${st} ${formatDay(today()).replace(/ /g, "\\s")} Chief GI-\\w+ Passed`));

    expect(pages.length).toBeGreaterThan(1);
    pages.forEach((p, i) => {
      expect(p).toContain(`Page ${i + 1} of ${pages.length}`);
      expect(p).toContain(`Caution: ${CAUTION_TEXT}`);
      expect(p).toContain(`Record hash ${hash} · made ${made}`);
    });
  });

  it("the record hash is SHA-256 over the content, the same for the same record and different once the record changes", async () => {
    actAs(s.as.chief);
    const first = (await inspectionPackRoute(...req(graduate))).headers.get("x-record-hash");
    // recomputed here from the content as printed (node:crypto), the chain's verification left out
    const doc = packDocument(await inspectionPackFor(s.as.chief, graduate));
    const printed = { ...doc, sections: doc.sections.filter((x) => x.heading !== "Audit chain verification") };
    expect(createHash("sha256").update(JSON.stringify(printed)).digest("hex")).toBe(first);
    expect((await inspectionPackRoute(...req(graduate))).headers.get("x-record-hash")).toBe(first);
    // an event written for another student moves the school's chain, not this record's hash
    const headBefore = (await chainHead(s.school.id)).position;
    await auditAnotherStudent();
    expect((await chainHead(s.school.id)).position).toBeGreaterThan(headBefore);
    expect((await inspectionPackRoute(...req(graduate))).headers.get("x-record-hash")).toBe(first);
    // a new version in Instructor One's file changes the content, so the hash
    await changeQualification(s.people.instructor.id, { ratings: ["Instrument ground instructor"] }, today());
    const changed = (await inspectionPackRoute(...req(graduate))).headers.get("x-record-hash");
    expect(changed).not.toBe(first);
  });

  it("is refused to instructors, students and sponsors (403)", async () => {
    for (const who of [s.as.instructor, s.as.student, s.as.sponsor]) {
      actAs(who);
      const res = await inspectionPackRoute(...req(graduate));
      expect(res.status).toBe(403);
      expect(await res.text()).not.toContain("Student 1");
    }
  });

  it("is a 404 for another school's student or an unknown id, and a 400 naming studentId for a malformed id", async () => {
    actAs(s.as.chief);
    const elsewhere = await inspectionPackRoute(...req(other.people.students[0]!.id));
    expect(elsewhere.status).toBe(404);
    expect(await elsewhere.json()).toEqual({ error: { status: 404, message: "studentId: no such student", field: "studentId" } });
    expect((await inspectionPackRoute(...req("00000000-0000-4000-8000-000000000000"))).status).toBe(404);
    const bad = await inspectionPackRoute(...req("not-an-id"));
    expect(bad.status).toBe(400);
    expect(await bad.json()).toMatchObject({ error: { status: 400, field: "studentId" } });
  });
});
