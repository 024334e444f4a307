jest.setTimeout(180_000);
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { makeSchool, closeDb, TEST_PASSWORD } from "@/tests/helpers/factories";
import { conductStageCheck, designateCheckInstructor } from "@/db/access/records/stage-checks";
import { stageReadiness } from "@/db/access/records/stage-readiness";
import { withdrawSignOff } from "@/db/access/records/sign-offs";
import { progressFor } from "@/db/access/records/progress-map";
import { signOffRegister } from "@/db/access/records/sign-off-register";
import { requireStudentFor } from "@/db/access/shared/student-scope";
import { RecordRefusal } from "@/db/access/records/refusals";
import { chiefRecordsSummary } from "@/db/access/records/chief-summary";
import { acknowledgeOralCheck } from "@/db/access/records/oral-check-corrections";
import { HttpError } from "@/lib/http/errors";
import { check, sign, itemId, auditCount, type School } from "./helpers";

afterAll(closeDb);

const AER = ["AER-01", "AER-02", "AER-03", "AER-04", "AER-05"];

async function stageId(s: School, code: string) {
  const [r] = await sequelize.query<{ id: string }>(`SELECT id FROM syllabus_stages WHERE revision_id = :r AND code = :c`, {
    replacements: { r: s.revision.id, c: code },
    type: QueryTypes.SELECT,
  });
  return r!.id;
}
async function signAllAer(s: School, studentId: string, user = s.as.instructor) {
  const ids = await Promise.all(AER.map((c) => itemId(s, c)));
  await check(user, studentId, ids);
  for (const id of ids) await sign(user, { studentId, itemId: id });
}
/** Every item of a stage with an oral outcome (the examiner chooses one for each). */
async function outcomesOf(stage: string, outcome: "solid" | "shaky" | "not_yet" = "solid") {
  const items = await sequelize.query<{ id: string }>(`SELECT id FROM syllabus_items WHERE stage_id = :stage ORDER BY position`, {
    replacements: { stage },
    type: QueryTypes.SELECT,
  });
  return items.map((i) => ({ itemId: i.id, outcome }));
}
const conduct = async (
  s: School,
  user: School["as"]["chief"],
  studentId: string,
  stage: string,
  over: Partial<Parameters<typeof conductStageCheck>[2]> = {},
) => {
  const oralOutcomes = await outcomesOf(stage);
  return sequelize.transaction((t) =>
    conductStageCheck(t, user, {
      studentId,
      stageId: stage,
      result: "pass",
      oralOutcomes,
      writtenScorePercent: 90,
      remarks: "",
      occurredAt: new Date(Date.now() - 60_000),
      password: TEST_PASSWORD,
      ...over,
    }),
  );
};
async function reason(p: Promise<unknown>) {
  try {
    await p;
  } catch (e) {
    if (e instanceof RecordRefusal) return e.reason;
    throw e;
  }
  return "accepted";
}

describe("stage checks", () => {
  let s: School;
  let student: string;
  let aer: string;
  beforeAll(async () => {
    s = await makeSchool("stage");
    student = s.people.students[0]!.id; // cohort A, lead: instructor
    aer = await stageId(s, "AER");
  });

  it("is not ready until every item is signed; the examiner is the chief or a designated check instructor, not the lead", async () => {
    expect(await reason(conduct(s, s.as.chief, student, aer))).toBe("not_ready");
    await signAllAer(s, student);
    const { student: ref } = await requireStudentFor(s.as.chief, student, "records");
    expect((await stageReadiness(ref))[0]).toMatchObject({ code: "AER", ready: true, signedCount: 5 });
    expect(await reason(conduct(s, s.as.instructor2, student, aer))).toBe("examiner_not_allowed");
    await sequelize.transaction((t) =>
      designateCheckInstructor(t, s.as.chief, { personId: s.people.instructor.id, checkInstructor: true }),
    );
    // designated now, but the lead instructor of this student
    expect(await reason(conduct(s, s.as.instructor, student, aer))).toBe("examiner_is_lead");
    expect(await reason(conduct(s, s.as.chief, student, aer, { writtenScorePercent: 70 }))).toBe("written_below_pass_mark");
  });

  it("a fail opens make-up items; a recheck waits for them; a pass unlocks the next stage", async () => {
    const aer04 = await itemId(s, "AER-04");
    const failed = await conduct(s, s.as.chief, student, aer, {
      result: "fail",
      writtenScorePercent: 60,
      oralOutcomes: (await outcomesOf(aer)).map((o) => (o.itemId === aer04 ? { ...o, outcome: "not_yet" as const } : o)),
    });
    expect(failed.makeupItemsOpened).toBe(1);
    expect(await reason(conduct(s, s.as.chief, student, aer))).toBe("not_ready");
    await sequelize.query(
      `UPDATE makeup_items SET state = 'done', closed_at = now(), closed_by_kind = 'one_to_one' WHERE source_id = :id`,
      { replacements: { id: failed.id } },
    );
    expect(await reason(check(s.as.instructor, student, [await itemId(s, "ATM-01")]))).toBe("stage_locked");
    const passed = await conduct(s, s.as.chief, student, aer);
    expect(passed.attempt).toBe(2);
    const c = await check(s.as.instructor, student, [await itemId(s, "ATM-01")], { levelShown: "rote" });
    expect(c.outcome).toBe("meets");
    expect(await auditCount(s.school.id, "stagecheck.failed", failed.id)).toBe(1);
    expect(await auditCount(s.school.id, "stagecheck.passed", passed.id)).toBe(1);
  });

  it("the chief may examine their own student with a reason, which raises a watch note", async () => {
    const s2 = await makeSchool("override");
    const st = s2.people.students[0]!.id;
    await sequelize.query(`UPDATE cohorts SET lead_instructor_id = :chief WHERE id = :c`, {
      replacements: { chief: s2.people.chief.id, c: s2.cohorts.a.id },
    });
    await signAllAer(s2, st, s2.as.chief);
    const stage = await stageId(s2, "AER");
    expect(await reason(conduct(s2, s2.as.chief, st, stage))).toBe("examiner_is_lead");
    const r = await conduct(s2, s2.as.chief, st, stage, { overrideReason: "The only check instructor is on leave this month." });
    const { notes, rows } = await signOffRegister(s2.as.chief);
    expect(notes.filter((n) => n.kind === "examiner_was_lead").map((n) => n.recordId)).toEqual([r.id]);
    expect(rows.find((x) => x.id === r.id)).toMatchObject({ kind: "stage_check", state: "pass" });
  });
});

describe("the register's watch notes and filters", () => {
  it("notes a withdrawal, a repeated Not yet, a late entry, a sign-off dated before its check; filters by instructor, cohort, stage and date", async () => {
    const s = await makeSchool("register");
    const [a, b] = [s.people.students[0]!.id, s.people.students[3]!.id];
    const aer1 = await itemId(s, "AER-01");
    const aer2 = await itemId(s, "AER-02");
    await check(s.as.instructor, a, [aer1]);
    const so = await sign(s.as.instructor, { studentId: a, itemId: aer1 });
    await sequelize.transaction((t) =>
      withdrawSignOff(t, s.as.instructor, { signOffId: so.id, reason: "Wrong student's check used", password: TEST_PASSWORD }),
    );
    await check(s.as.instructor, a, [aer2], { question: { outcome: "not_yet" } });
    await check(s.as.instructor, a, [aer2], { question: { outcome: "not_yet" } });
    const late = await check(s.as.instructor2, b, [aer1], {
      occurredAt: new Date(Date.now() - 20 * 86_400_000),
      levelShown: "understanding",
    });
    // a check dated today, signed for yesterday: before its check
    const yesterday = new Date(Date.now() - 86_400_000).toISOString().slice(0, 10);
    await check(s.as.instructor2, b, [aer2]);
    const early = await sign(s.as.instructor2, { studentId: b, itemId: aer2, signedOn: yesterday });

    const { rows, notes } = await signOffRegister(s.as.chief);
    const kinds = (id: string) => notes.filter((n) => n.recordId === id).map((n) => n.kind);
    expect(kinds(so.id)).toContain("withdrawn");
    expect(kinds(late.id)).toContain("late_entry");
    expect(kinds(early.id)).toContain("signed_before_check");
    expect(notes.some((n) => n.kind === "repeated_not_yet" && n.itemCode === "AER-02" && n.studentId === a)).toBe(true);
    expect(rows.find((r) => r.id === so.id)).toMatchObject({
      state: "withdrawn",
      reason: "Wrong student's check used",
      studentName: "Student 1",
    });

    const byInstructor2 = await signOffRegister(s.as.chief, { instructorId: s.people.instructor2.id });
    expect(byInstructor2.rows.map((r) => r.id)).toEqual([early.id]);
    const byCohortA = await signOffRegister(s.as.chief, { cohortId: s.cohorts.a.id });
    expect(byCohortA.rows.map((r) => r.id)).toEqual([so.id]);
    expect((await signOffRegister(s.as.chief, { stageId: await stageId(s, "ATM") })).rows).toEqual([]);
    expect((await signOffRegister(s.as.chief, { to: "2000-01-01" })).rows).toEqual([]);

    const summary = await chiefRecordsSummary(s.as.chief);
    expect(summary.chain.ok).toBe(true);
    expect(summary.notes.length).toBe(notes.length);
  });
});

describe("the Progress map is scoped and keeps remarks from students and sponsors", () => {
  it("student own, instructor their cohort, sponsor only when shared, remarks only for staff", async () => {
    const s = await makeSchool("progress");
    const ada = s.people.students[0]!.id; // cohort A, sponsored
    const c = await check(s.as.instructor, ada, [await itemId(s, "AER-01")], { remarks: "secret remark about nerves" });
    const own = await progressFor(s.as.student, ada);
    expect(own.access).toBe("self");
    expect(JSON.stringify(own)).not.toContain("secret remark");
    expect(own.stages[0]!.items.find((i) => i.code === "AER-01")!.status).toBe("checked");
    const staff = await progressFor(s.as.instructor, ada);
    expect(JSON.stringify(staff)).toContain("secret remark");
    const sponsor = await progressFor(s.as.sponsor, ada);
    expect(sponsor.access).toBe("sponsor");
    expect(JSON.stringify(sponsor)).not.toContain("secret remark");
    expect(JSON.stringify(sponsor)).not.toContain("Explain it");
    // not theirs: 404 for the other cohort's lead, another student, the sponsor of someone else
    for (const [who, id] of [
      [s.as.instructor2, ada],
      [s.as.otherStudent, ada],
      [s.as.sponsor, s.people.students[1]!.id],
    ] as const) {
      await expect(progressFor(who, id)).rejects.toMatchObject({ status: 404 });
    }
    await sequelize.query(`UPDATE sponsor_links SET shares_progress = false WHERE sponsor_id = :s`, {
      replacements: { s: s.people.sponsor.id },
    });
    await expect(progressFor(s.as.sponsor, ada)).rejects.toBeInstanceOf(HttpError);
    // the student acknowledges the debrief once; another student cannot
    await expect(sequelize.transaction((t) => acknowledgeOralCheck(t, s.as.otherStudent, c.id))).rejects.toMatchObject({ status: 404 });
    const ack = await sequelize.transaction((t) => acknowledgeOralCheck(t, s.as.student, c.id));
    const again = await sequelize.transaction((t) => acknowledgeOralCheck(t, s.as.student, c.id));
    expect([ack.first, again.first]).toEqual([true, false]);
    expect(await auditCount(s.school.id, "check.acknowledged", c.id)).toBe(1);
  });

  it("a check with a Not yet queues the student's mail in the same transaction", async () => {
    const s = await makeSchool("notyet");
    const c = await check(s.as.instructor, s.people.students[0]!.id, [await itemId(s, "AER-02")], { question: { outcome: "not_yet" } });
    expect(c.notYetMailed).toBe(true);
    const [m] = await sequelize.query<{ subject: string; to_address: string }>(
      `SELECT subject, to_address FROM outbox WHERE kind = 'check.notyet' AND idempotency_key LIKE :k`,
      { replacements: { k: `check.notyet:${c.id}:%` }, type: QueryTypes.SELECT },
    );
    expect(m!.to_address).toBe(s.people.students[0]!.email);
    expect(m!.subject).toMatch(/one item to revisit/);
  });
});
