jest.setTimeout(180_000);
jest.mock("next/cache", () => ({ revalidatePath: jest.fn() }));
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { makeSchool, closeDb, actAs, TEST_PASSWORD } from "@/tests/helpers/factories";
import { amendCheckAction, conductStageCheckAction, recordCheckAction } from "@/app/(app)/records/actions";
import { reviewWatchNoteAction } from "@/app/(app)/register/actions";
import { conductStageCheck, designateCheckInstructor } from "@/db/access/records/stage-checks";
import { withdrawOralCheck } from "@/db/access/records/oral-check-corrections";
import { progressFor } from "@/db/access/records/progress-map";
import { signOffRegister } from "@/db/access/records/sign-off-register";
import { listChecksOfStudent } from "@/db/access/records/check-history";
import { scheduleSession } from "@/db/access/timetable/schedule-session";
import { recordAttendance } from "@/db/access/ground-log/record-attendance";
import { scheduleSessionSchema, recordAttendanceSchema } from "@/lib/timetable/schema";
import { makeBriefing, addRooms } from "@/tests/integration/timetable/helpers";
import { check, sign, itemId, auditCount, type School } from "./helpers";

// Issue 12, "Assessment integrity": each test failed on the behaviour before the change.

afterAll(async () => {
  actAs(null);
  await closeDb();
});

const AER = ["AER-01", "AER-02", "AER-03", "AER-04", "AER-05"];
const q = (item: string, outcome: "solid" | "shaky" | "not_yet", required = true) => ({
  syllabusItemId: item,
  questionText: "Explain it",
  answerSummary: "",
  outcome,
  required,
  prompted: false,
  correctiveGiven: false,
});

async function stageId(s: School, code: string) {
  const [r] = await sequelize.query<{ id: string }>(`SELECT id FROM syllabus_stages WHERE revision_id = :r AND code = :c`, {
    replacements: { r: s.revision.id, c: code },
    type: QueryTypes.SELECT,
  });
  return r!.id;
}

/** A session covering the codes for cohort A, with one attendance line for the student. */
async function sessionWith(s: School, codes: string[], studentId: string, status: "attended" | "absent", date: string) {
  const b = await makeBriefing(s, `Briefing ${codes.join(" ")}`, codes);
  await addRooms(s, ["Hangar classroom"]);
  const session = await sequelize.transaction((t) =>
    scheduleSession(
      s.as.instructor,
      scheduleSessionSchema.parse({
        briefingId: b.id,
        date,
        time: "09:00",
        durationMinutes: 60,
        room: "Hangar classroom",
        instructorId: s.people.instructor.id,
        cohortId: s.cohorts.a.id,
      }),
      t,
    ),
  );
  await sequelize.transaction((t) =>
    recordAttendance(s.as.instructor, recordAttendanceSchema.parse({ sessionId: session.id, lines: [{ studentId, status }] }), t),
  );
}

describe("each sign-off shows its own basis", () => {
  it("an AER-03 sign-off on a check where AER-03 met the standard and AER-04 did not reads 'meets the standard', in the register and its CSV rows", async () => {
    const s = await makeSchool("basis");
    const st = s.people.students[0]!.id;
    const [a3, a4] = [await itemId(s, "AER-03"), await itemId(s, "AER-04")];
    const c = await check(s.as.instructor, st, [a3, a4], { questions: [q(a3, "solid"), q(a4, "not_yet")] });
    expect(c.outcome).toBe("not_yet");
    const so = await sign(s.as.instructor, { studentId: st, itemId: a3 });
    const { rows } = await signOffRegister(s.as.chief);
    const row = rows.find((r) => r.id === so.id)!;
    expect(row.basis).toMatch(/AER-03: meets the standard \(Solid\)/);
    expect(row.basis).not.toContain("Not yet");
  });
});

describe("the Progress map agrees with the record", () => {
  let s: School;
  beforeAll(async () => {
    s = await makeSchool("map");
  });

  it("an item's badge is its own result over all its questions in its latest check in force, not its last question", async () => {
    const st = s.people.students[0]!.id;
    const a3 = await itemId(s, "AER-03");
    // Shaky first, then Solid: the item does not meet the standard, its badge is Shaky
    await check(s.as.instructor, st, [a3], { questions: [q(a3, "shaky"), q(a3, "solid")] });
    // a later check, withdrawn: it does not count
    const later = await check(s.as.instructor, st, [a3], { occurredAt: new Date(Date.now() - 30_000), questions: [q(a3, "not_yet")] });
    await sequelize.transaction((t) =>
      withdrawOralCheck(t, s.as.instructor, { checkId: later.id, reason: "Wrong student", password: TEST_PASSWORD }),
    );
    const map = await progressFor(s.as.chief, st);
    const item = map.stages.flatMap((x) => x.items).find((i) => i.code === "AER-03")!;
    expect(item.lastOutcome).toBe("shaky");
  });

  it("an item taught in a session the student attended reads Taught, not Not started", async () => {
    const st = s.people.students[1]!.id;
    await sessionWith(s, ["ATM-01"], st, "attended", "2026-11-20");
    const map = await progressFor(s.as.chief, st);
    const items = map.stages.flatMap((x) => x.items);
    expect(items.find((i) => i.code === "ATM-01")!.status).toBe("taught");
    expect(items.find((i) => i.code === "ATM-02")!.status).toBe("not_started");
  });

  it("'Stage passed' names the stage check's examiner and date, not the item's signer", async () => {
    const st = s.people.students[2]!.id;
    const ids = await Promise.all(AER.map((c) => itemId(s, c)));
    await check(s.as.instructor, st, ids);
    for (const id of ids) await sign(s.as.instructor, { studentId: st, itemId: id });
    const aer = await stageId(s, "AER");
    await sequelize.transaction((t) =>
      conductStageCheck(t, s.as.chief, {
        studentId: st,
        stageId: aer,
        result: "pass",
        oralOutcomes: ids.map((itemId) => ({ itemId, outcome: "solid" as const })),
        writtenScorePercent: 90,
        remarks: "",
        occurredAt: new Date(Date.now() - 60_000),
        password: TEST_PASSWORD,
      }),
    );
    const map = await progressFor(s.as.chief, st);
    const item = map.stages.flatMap((x) => x.items).find((i) => i.code === "AER-01")!;
    expect(item.status).toBe("stage_passed");
    expect(item.stagePassed).toMatchObject({ examinerName: "Chief", on: expect.stringMatching(/^\d{4}-\d{2}-\d{2}$/) });
    expect(item.signerName).toBe("Instructor One");
  });
});

describe("stage checks are signed like sign-offs", () => {
  it("a wrong password is refused naming the field; the signed check keeps the statement", async () => {
    const s = await makeSchool("stagesign");
    const st = s.people.students[3]!.id; // cohort B, lead Instructor Two
    const ids = await Promise.all(AER.map((c) => itemId(s, c)));
    await check(s.as.instructor2, st, ids);
    for (const id of ids) await sign(s.as.instructor2, { studentId: st, itemId: id });
    const stage = await stageId(s, "AER");
    const input = {
      studentId: st,
      stageId: stage,
      result: "pass",
      oralOutcomes: ids.map((itemId) => ({ itemId, outcome: "solid" })),
      remarks: "",
      occurredAt: new Date(Date.now() - 60_000).toISOString(),
    };
    actAs(s.as.chief);
    expect(await conductStageCheckAction(input)).toMatchObject({ ok: false, status: 400, field: "password" });
    expect(await conductStageCheckAction({ ...input, password: "not-the-password" })).toMatchObject({
      ok: false,
      status: 422,
      field: "password",
    });
    // the lead of this student, though designated, is refused (as before)
    await sequelize.transaction((t) =>
      designateCheckInstructor(t, s.as.chief, { personId: s.people.instructor2.id, checkInstructor: true }),
    );
    actAs(s.as.instructor2);
    expect(await conductStageCheckAction({ ...input, password: TEST_PASSWORD })).toMatchObject({ ok: false, field: "examiner" });
    actAs(s.as.chief);
    const r = await conductStageCheckAction({ ...input, password: TEST_PASSWORD });
    expect(r).toMatchObject({ ok: true, data: { result: "pass" } });
    const [row] = await sequelize.query<{ statement: string }>(`SELECT statement FROM stage_checks WHERE id = :id`, {
      replacements: { id: r.ok ? r.data.id : "" },
      type: QueryTypes.SELECT,
    });
    expect(row!.statement).toMatch(/^I, Chief, certify that I examined Student 4 in the stage check of stage AER/);
  });
});

describe("corrections from the screen", () => {
  it("amending needs the recorder or the chief, a reason and the password; the original stays, marked amended", async () => {
    const s = await makeSchool("amend");
    const st = s.people.students[0]!.id;
    const a1 = await itemId(s, "AER-01");
    const orig = await check(s.as.instructor, st, [a1], { questions: [q(a1, "not_yet")] });
    const input = {
      studentId: st,
      itemIds: [a1],
      levelShown: "correlation",
      durationMinutes: 10,
      occurredAt: new Date(Date.now() - 60_000).toISOString(),
      questions: [q(a1, "solid")],
      amends: { checkId: orig.id, reason: "Outcome entered on the wrong line" },
      password: TEST_PASSWORD,
    };
    actAs(s.as.instructor2);
    expect(await amendCheckAction(input)).toMatchObject({ ok: false, status: 404 }); // not their student
    actAs(s.as.instructor);
    expect(await amendCheckAction({ ...input, amends: { checkId: orig.id, reason: "" } })).toMatchObject({
      ok: false,
      field: "amends.reason",
    });
    expect(await amendCheckAction({ ...input, password: "wrong-password-9" })).toMatchObject({ ok: false, status: 422, field: "password" });
    const r = await amendCheckAction(input);
    expect(r).toMatchObject({ ok: true, data: { outcome: "meets" } });
    const history = await listChecksOfStudent(s.school.id, st, { withRemarks: true });
    expect(history.find((c) => c.id === orig.id)).toMatchObject({ amendedBy: r.ok ? r.data.id : "", outcome: "not_yet" });
    expect(await auditCount(s.school.id, "check.amended", r.ok ? r.data.id : undefined)).toBe(1);
    expect(await amendCheckAction(input)).toMatchObject({ ok: false, status: 409 });
  });

  it("a check meeting the standard closes the item's open make-up items in the same transaction, linked to the check", async () => {
    const s = await makeSchool("makeupclose");
    const st = s.people.students[0]!.id;
    await sessionWith(s, ["AER-01", "AER-02"], st, "absent", "2026-11-21");
    const [a1, a2] = [await itemId(s, "AER-01"), await itemId(s, "AER-02")];
    actAs(s.as.instructor);
    const r = await recordCheckAction({
      studentId: st,
      itemIds: [a1, a2],
      levelShown: "correlation",
      durationMinutes: 10,
      occurredAt: new Date().toISOString(),
      questions: [q(a1, "solid"), q(a2, "shaky")],
    });
    expect(r.ok).toBe(true);
    const rows = await sequelize.query<{ code: string; state: string; closed_by_kind: string | null; closed_by_id: string | null }>(
      `SELECT i.code, m.state, m.closed_by_kind, m.closed_by_id FROM makeup_items m JOIN syllabus_items i ON i.id = m.syllabus_item_id
        WHERE m.student_id = :st ORDER BY i.code`,
      { replacements: { st }, type: QueryTypes.SELECT },
    );
    expect(rows).toEqual([
      { code: "AER-01", state: "done", closed_by_kind: "oral_check", closed_by_id: r.ok ? r.data.id : "" },
      { code: "AER-02", state: "open", closed_by_kind: null, closed_by_id: null },
    ]);
    // AER-01 can now be signed off
    expect((await sign(s.as.instructor, { studentId: st, itemId: a1 })).generation).toBe(1);
  });
});

describe("watch notes can be reviewed", () => {
  it("the chief marks a note reviewed with a remark: appended, audited, shown with the note; never changed or deleted", async () => {
    const s = await makeSchool("review");
    const st = s.people.students[0]!.id;
    const a1 = await itemId(s, "AER-01");
    const late = await check(s.as.instructor, st, [a1], { occurredAt: new Date(Date.now() - 20 * 86_400_000) });
    const note = { recordType: "oral_check", recordId: late.id, kind: "late_entry", remark: "Paper notes seen; entry is right." };
    actAs(s.as.instructor);
    expect(await reviewWatchNoteAction(note)).toMatchObject({ ok: false, status: 403 });
    actAs(s.as.chief);
    expect(await reviewWatchNoteAction({ ...note, remark: "" })).toMatchObject({ ok: false, status: 400, field: "remark" });
    expect(await reviewWatchNoteAction({ ...note, kind: "withdrawn" })).toMatchObject({ ok: false, status: 404 });
    const r = await reviewWatchNoteAction(note);
    expect(r.ok).toBe(true);
    const { notes } = await signOffRegister(s.as.chief);
    const reviewed = notes.find((n) => n.recordId === late.id && n.kind === "late_entry")!;
    expect(reviewed.reviews).toEqual([
      { remark: "Paper notes seen; entry is right.", reviewerName: "Chief", reviewedAt: expect.any(Date) },
    ]);
    expect(await auditCount(s.school.id, "watchnote.reviewed", late.id)).toBe(1);
    await expect(
      sequelize.query(`UPDATE watch_note_reviews SET remark = 'changed' WHERE school_id = :s`, { replacements: { s: s.school.id } }),
    ).rejects.toThrow();
    await expect(
      sequelize.query(`DELETE FROM watch_note_reviews WHERE school_id = :s`, { replacements: { s: s.school.id } }),
    ).rejects.toThrow();
  });
});

describe("nothing starts as a pass (server)", () => {
  it("a check without outcome, element kind or level is refused naming each field, and nothing is written", async () => {
    const s = await makeSchool("nopass");
    const st = s.people.students[0]!.id;
    const a1 = await itemId(s, "AER-01");
    actAs(s.as.instructor);
    const r = await recordCheckAction({
      studentId: st,
      itemIds: [a1],
      durationMinutes: 10,
      occurredAt: new Date(Date.now() - 60_000).toISOString(),
      questions: [{ syllabusItemId: a1, questionText: "Explain it", answerSummary: "" }],
    });
    expect(r).toMatchObject({ ok: false, status: 400 });
    const errors = r.ok ? {} : (r.fieldErrors ?? {});
    expect(errors.levelShown?.[0]).toMatch(/level of learning/);
    expect(errors["questions.0.outcome"]?.[0]).toMatch(/outcome/);
    expect(errors["questions.0.required"]?.[0]).toMatch(/required element/);
    const [n] = await sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM oral_checks WHERE student_id = :st`, {
      replacements: { st },
      type: QueryTypes.SELECT,
    });
    expect(n!.n).toBe(0);
  });

  it("a stage check without a result or an item's oral outcome is refused naming the field", async () => {
    const s = await makeSchool("nopass-stage");
    actAs(s.as.chief);
    const r = await conductStageCheckAction({
      studentId: s.people.students[0]!.id,
      stageId: await stageId(s, "AER"),
      oralOutcomes: [{ itemId: await itemId(s, "AER-01") }],
      remarks: "",
      occurredAt: new Date().toISOString(),
      password: TEST_PASSWORD,
    });
    const errors = r.ok ? {} : (r.fieldErrors ?? {});
    expect(errors.result?.[0]).toMatch(/choose the result/);
    expect(errors["oralOutcomes.0.outcome"]?.[0]).toMatch(/oral outcome/);
  });
});
