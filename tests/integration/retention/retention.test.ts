jest.mock("next/cache", () => ({ revalidatePath: jest.fn() }));
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { makeSchool, closeDb, actAs } from "@/tests/helpers/factories";
import { archiveRecordAction, liftLegalHoldAction, saveRetentionSettingsAction, setLegalHoldAction } from "@/app/(app)/retention/actions";
import { LISTED_STATES, retentionOverview, retentionOf } from "@/db/access/retention/records";
import { addYears } from "@/lib/retention/rules";
import { dateInZone } from "@/lib/time";
import { check, auditCount, type School } from "../records/helpers";
import { itemsOfRevision } from "@/db/access/records/items";

// Retention of records (issue 13), counted from the end of training: at least 1 year for school
// training records (14 CFR 141.101(d)), 3 years for instructor records (14 CFR 61.189(c)), 3 years
// for an EASA school (EASA ORA.ATO.120); the longest that applies; a legal hold the chief sets and
// lifts with a reason; past the date the record is listed for the chief to archive, and archiving
// deletes nothing.

let s: School;
let other: School;
const today = () => dateInZone(new Date(), "Europe/London");
const dayBefore = (d: string) => new Date(Date.parse(`${d}T00:00:00Z`) - 86_400_000).toISOString().slice(0, 10);

async function endTrainingOn(studentId: string, endedOn: string) {
  await sequelize.query(
    `UPDATE enrolments SET status = 'completed', ended_on = :d, end_kind = 'graduated', end_reason = 'completed the course' WHERE student_id = :s`,
    { replacements: { s: studentId, d: endedOn } },
  );
}
async function rules(v: { schoolRecords: boolean; instructorRecords: boolean; easaAto: boolean }) {
  actAs(s.as.chief);
  const r = await saveRetentionSettingsAction(v);
  expect(r.ok).toBe(true);
}
async function rowCounts(studentId: string) {
  const [r] = await sequelize.query<Record<string, number>>(
    `SELECT (SELECT count(*)::int FROM people WHERE id = :s) AS people, (SELECT count(*)::int FROM enrolments WHERE student_id = :s) AS enrolments,
            (SELECT count(*)::int FROM oral_checks WHERE student_id = :s) AS checks, (SELECT count(*)::int FROM cohort_memberships WHERE student_id = :s) AS memberships`,
    { replacements: { s: studentId }, type: QueryTypes.SELECT },
  );
  return r!;
}

const [A, B, C, D] = [0, 1, 2, 3];
const id = (n: number) => s.people.students[n]!.id;

beforeAll(async () => {
  s = await makeSchool("retain");
  other = await makeSchool("retain-other");
  const item = (await itemsOfRevision(s.revision.id))[0]!;
  await check(s.as.instructor, id(A), [item.id]);
  // A: ended 3 years and a day ago; B: ended exactly 3 years ago; C: ended a year and a day ago; D: in training
  await endTrainingOn(id(A), dayBefore(addYears(today(), -3)));
  await endTrainingOn(id(B), addYears(today(), -3));
  await endTrainingOn(id(C), dayBefore(addYears(today(), -1)));
}, 60_000);
afterAll(async () => {
  actAs(null);
  await closeDb();
});

describe("retention dates across the three rules", () => {
  it("with the school's records and the instructor records (the defaults), 3 years wins over 1 (141.101(d), 61.189(c))", async () => {
    const a = (await retentionOf(s.school.id, id(A)))!;
    expect(a).toMatchObject({ state: "due", keepUntil: dayBefore(today()), governing: ["instructor_records"] });
    const b = (await retentionOf(s.school.id, id(B)))!;
    expect(b).toMatchObject({ state: "kept", keepUntil: today() });
    expect((await retentionOf(s.school.id, id(C)))!.state).toBe("kept");
    expect((await retentionOf(s.school.id, id(D)))!).toMatchObject({ state: "in_training", keepUntil: null });
  });

  it("with only the school's records, 1 year (14 CFR 141.101(d)); the change is audited", async () => {
    const before = await auditCount(s.school.id, "retention.settings");
    await rules({ schoolRecords: true, instructorRecords: false, easaAto: false });
    expect(await auditCount(s.school.id, "retention.settings")).toBe(before + 1);
    const c = (await retentionOf(s.school.id, id(C)))!;
    expect(c).toMatchObject({ state: "due", keepUntil: dayBefore(today()), governing: ["school_records"] });
    expect((await retentionOf(s.school.id, id(B)))!.state).toBe("due");
  });

  it("with an EASA school's rule, 3 years (EASA ORA.ATO.120)", async () => {
    await rules({ schoolRecords: true, instructorRecords: false, easaAto: true });
    expect((await retentionOf(s.school.id, id(C)))!).toMatchObject({ state: "kept", governing: ["easa_ato"] });
    expect((await retentionOf(s.school.id, id(B)))!).toMatchObject({ state: "kept", keepUntil: today() });
    expect((await retentionOf(s.school.id, id(A)))!).toMatchObject({ state: "due", governing: ["easa_ato"] });
  });

  it("refuses a settings form with no rule, naming the field", async () => {
    actAs(s.as.chief);
    const r = await saveRetentionSettingsAction({ schoolRecords: false, instructorRecords: false, easaAto: false });
    expect(r).toMatchObject({ ok: false, status: 400, field: "schoolRecords" });
  });

  it("lists only the records whose training has ended", async () => {
    const list = await retentionOverview(s.as.chief);
    const ids = LISTED_STATES.flatMap((state) => list.sections[state].map((r) => r.studentId));
    expect(ids).toEqual(expect.arrayContaining([id(A), id(B), id(C)]));
    expect(ids).not.toContain(id(D));
    expect(ids).not.toContain(other.people.students[0]!.id);
  });
});

describe("legal hold", () => {
  it("keeps a record past its date until the chief lifts it, each step with a reason and audited", async () => {
    actAs(s.as.chief);
    const set = await setLegalHoldAction({ studentId: id(A), reason: "Records requested in a pending claim" });
    expect(set.ok).toBe(true);
    expect((await retentionOf(s.school.id, id(A)))!).toMatchObject({
      state: "held",
      hold: { reason: "Records requested in a pending claim" },
    });
    expect(await setLegalHoldAction({ studentId: id(A), reason: "again" })).toMatchObject({ ok: false, status: 409, field: "studentId" });
    const refused = await archiveRecordAction({ studentId: id(A) });
    expect(refused).toMatchObject({ ok: false, status: 422, field: "studentId" });
    expect(!refused.ok && refused.message).toMatch(/legal hold/);
    expect(await liftLegalHoldAction({ holdId: set.ok ? set.data.holdId : "", reason: "" })).toMatchObject({
      ok: false,
      status: 400,
      field: "reason",
    });
    const lifted = await liftLegalHoldAction({ holdId: set.ok ? set.data.holdId : "", reason: "Claim settled" });
    expect(lifted.ok).toBe(true);
    expect((await retentionOf(s.school.id, id(A)))!.state).toBe("due");
    expect(await auditCount(s.school.id, "retention.hold")).toBe(1);
    expect(await auditCount(s.school.id, "retention.hold_lifted")).toBe(1);
    const [h] = await sequelize.query<{ reason: string; lifted_reason: string }>(
      `SELECT reason, lifted_reason FROM retention_holds WHERE student_id = :s`,
      {
        replacements: { s: id(A) },
        type: QueryTypes.SELECT,
      },
    );
    expect(h).toEqual({ reason: "Records requested in a pending claim", lifted_reason: "Claim settled" });
  });
});

describe("archive", () => {
  it("marks a record past its date archived, audited, and deletes nothing", async () => {
    actAs(s.as.chief);
    const before = await rowCounts(id(A));
    expect(before.checks).toBe(1);
    const r = await archiveRecordAction({ studentId: id(A) });
    expect(r.ok).toBe(true);
    expect(await rowCounts(id(A))).toEqual(before);
    expect((await retentionOf(s.school.id, id(A)))!.state).toBe("archived");
    expect(await auditCount(s.school.id, "retention.archive")).toBe(1);
    expect(await archiveRecordAction({ studentId: id(A) })).toMatchObject({ ok: false, status: 409 });
  });

  it("refuses a record still within its period and a student in training, naming the student", async () => {
    actAs(s.as.chief);
    const kept = await archiveRecordAction({ studentId: id(B) });
    expect(kept).toMatchObject({ ok: false, status: 422, field: "studentId" });
    expect(!kept.ok && kept.message).toMatch(/kept until/);
    expect(await archiveRecordAction({ studentId: id(D) })).toMatchObject({ ok: false, status: 422, field: "studentId" });
  });

  it("the archived mark is append-only: the database refuses to change or delete it", async () => {
    await expect(
      sequelize.query(`DELETE FROM record_archivals WHERE school_id = :s`, { replacements: { s: s.school.id } }),
    ).rejects.toThrow(/append-only|permission denied/);
    await expect(
      sequelize.query(`UPDATE record_archivals SET keep_until = keep_until + 1 WHERE school_id = :s`, { replacements: { s: s.school.id } }),
    ).rejects.toThrow(/append-only|permission denied/);
  });
});

describe("permissions", () => {
  it("refuses every retention action to instructors, students and sponsors, and another school's chief", async () => {
    for (const user of [s.as.instructor, s.as.student, s.as.sponsor]) {
      actAs(user);
      expect(await saveRetentionSettingsAction({ schoolRecords: true, instructorRecords: true, easaAto: false })).toMatchObject({
        status: 403,
      });
      expect(await setLegalHoldAction({ studentId: id(C), reason: "a reason" })).toMatchObject({ status: 403 });
      expect(await archiveRecordAction({ studentId: id(C) })).toMatchObject({ status: 403 });
    }
    actAs(null);
    expect(await archiveRecordAction({ studentId: id(C) })).toMatchObject({ status: 401 });
    actAs(other.as.chief);
    expect(await setLegalHoldAction({ studentId: id(C), reason: "a reason" })).toMatchObject({ status: 404 });
    expect(await archiveRecordAction({ studentId: id(B) })).toMatchObject({ status: 404 });
    await expect(retentionOverview(s.as.instructor)).rejects.toThrow(/chief/);
    expect(await auditCount(s.school.id, "retention.hold")).toBe(1);
  });
});
