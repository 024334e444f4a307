import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { makeSchool, closeDb, actAs } from "@/tests/helpers/factories";
import { withdrawFromCohortAction } from "@/app/(app)/completion/actions";
import { auditCount, type School } from "../records/helpers";
import { endTrainingToday, enrolment, today } from "./helpers";

// Withdrawing a student (issue 13): from the cohort with a date and a reason (the enrolment goes on),
// or from the course, which is the end of training as terminated (the enrolment ends with its date and
// reason, the record is certified, and the cohort membership ends on the same date).

let s: School;

beforeAll(async () => {
  s = await makeSchool("wdr");
});
afterAll(async () => {
  actAs(null);
  await closeDb();
});

async function memberships(studentId: string) {
  return sequelize.query<{ from_date: string; to_date: string | null; end_reason: string | null }>(
    `SELECT from_date, to_date, end_reason FROM cohort_memberships WHERE student_id = :studentId ORDER BY from_date`,
    { replacements: { studentId }, type: QueryTypes.SELECT },
  );
}

describe("withdrawal from a cohort", () => {
  it("is refused without a reason, naming the field, and writes nothing", async () => {
    const st = s.people.students[1]!.id;
    actAs(s.as.chief);
    const before = await memberships(st);
    for (const reason of [undefined, "", "  "]) {
      const r = await withdrawFromCohortAction({
        studentId: st,
        leftOn: today(),
        reason,
        idempotencyKey: `wdr-${reason?.length ?? "u"}-key`,
      });
      expect(r).toMatchObject({ ok: false, status: 400, field: "reason" });
      expect(!r.ok && r.message).toMatch(/^Reason: /);
    }
    expect(await memberships(st)).toEqual(before);
  });

  it("is refused for callers who may not manage cohorts, and writes nothing", async () => {
    const st = s.people.students[1]!.id;
    const before = await memberships(st);
    for (const who of [s.as.instructor, s.as.student, s.as.sponsor]) {
      actAs(who);
      expect(await withdrawFromCohortAction({ studentId: st, leftOn: today(), reason: "moving to the evening course" })).toMatchObject({
        ok: false,
        status: 403,
      });
    }
    expect(await memberships(st)).toEqual(before);
  });

  it("refuses a date when the student belonged to no cohort, and a date later than today", async () => {
    const st = s.people.students[1]!.id;
    actAs(s.as.chief);
    expect(await withdrawFromCohortAction({ studentId: st, leftOn: "2026-08-15", reason: "too early" })).toMatchObject({
      ok: false,
      status: 409,
      field: "leftOn",
    });
    expect(await withdrawFromCohortAction({ studentId: st, leftOn: "2099-01-01", reason: "in the future" })).toMatchObject({
      ok: false,
      status: 400,
      field: "leftOn",
    });
  });

  it("ends the membership on the date with the reason, audited, and the student stays enrolled", async () => {
    const st = s.people.students[1]!.id;
    actAs(s.as.chief);
    const audits = await auditCount(s.school.id, "cohort.withdrawn");
    const input = { studentId: st, leftOn: today(), reason: "works shifts; joins a later cohort", idempotencyKey: "wdr-cohort-once-1" };
    const r = await withdrawFromCohortAction(input);
    expect(r).toMatchObject({ ok: true, data: { cohortName: s.cohorts.a.name, leftOn: today() } });
    // a double submit with the same key changes nothing more
    expect(await withdrawFromCohortAction(input)).toMatchObject({ ok: true, replayed: true });
    expect(await memberships(st)).toEqual([
      { from_date: "2026-09-01", to_date: today(), end_reason: "works shifts; joins a later cohort" },
    ]);
    expect(await auditCount(s.school.id, "cohort.withdrawn")).toBe(audits + 1);
    expect((await enrolment(st)).status).toBe("active");
    // once out of the cohort, a second withdrawal (another form) finds no cohort
    expect(await withdrawFromCohortAction({ ...input, idempotencyKey: "wdr-cohort-once-2" })).toMatchObject({
      ok: false,
      status: 409,
      field: "leftOn",
    });
  });
});

describe("withdrawal from the course (end of training as terminated)", () => {
  it("is refused without a reason, naming the field", async () => {
    const st = s.people.students[2]!.id;
    actAs(s.as.chief);
    const r = await endTrainingToday({ studentId: st, kind: "terminated", reason: "" });
    expect(r).toMatchObject({ ok: false, status: 400, field: "reason" });
    expect((await enrolment(st)).status).toBe("active");
    expect((await memberships(st))[0]!.to_date).toBeNull();
  });

  it("ends the enrolment and the cohort membership on the date with the reason", async () => {
    const st = s.people.students[2]!.id;
    actAs(s.as.chief);
    const r = await endTrainingToday({ studentId: st, kind: "terminated", reason: "left the area", idempotencyKey: "wdr-course-1" });
    expect(r).toMatchObject({ ok: true, data: { status: "withdrawn", leftCohorts: 1 } });
    expect(await enrolment(st)).toEqual({ status: "withdrawn", ended_on: today(), end_reason: "left the area", end_kind: "terminated" });
    expect(await memberships(st)).toEqual([{ from_date: "2026-09-01", to_date: today(), end_reason: "left the area" }]);
  });
});
