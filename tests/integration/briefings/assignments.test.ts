import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { makeSchool, closeDb, actAs } from "@/tests/helpers/factories";
import { createBriefingAction } from "@/app/(app)/briefings/actions";
import { createAssignmentAction, setAssignmentDoneAction } from "@/app/(app)/assignments/actions";
import { assignmentCompletion } from "@/db/access/assignments/staff-assignments";
import { isDemoAssignedToStudent, listAssignedDemosForStudent } from "@/db/access/assignments/assigned-to-student";
import { listAssignmentsForStudent } from "@/db/access/assignments/student-assignments";
import { fixedClock, resetClock } from "@/lib/clock";

jest.mock("next/cache", () => ({ revalidatePath: jest.fn() }));
afterEach(resetClock);
afterAll(async () => {
  actAs(null);
  await closeDb();
});

type School = Awaited<ReturnType<typeof makeSchool>>;
const count = async (sql: string, replacements: Record<string, unknown>) =>
  (await sequelize.query<{ n: number }>(sql, { replacements, type: QueryTypes.SELECT }))[0]!.n;

async function briefing(s: School, demoRevisionIds: string[] = []) {
  actAs(s.as.instructor);
  const r = await createBriefingAction({
    courseId: s.course.id,
    syllabusRevisionId: s.revision.id,
    title: "Speed stability either side of Vmd",
    objective: "Predict what a gust does below and above Vmd.",
    syllabusItemIds: [],
    elements: [
      { title: "Gust below Vmd", instructorActions: "Show the drag curve.", studentActions: "Predict the response.", minutes: 20 },
    ],
    equipment: "",
    demoRevisionIds,
    completionStandard: "Predicts both responses.",
    handoutIds: [],
    changeNote: "",
  });
  if (!r.ok) throw new Error(r.message);
  return r.data.briefingId;
}

/** A demo with one revision, written straight into Curve Lab's tables (their shape per the cross-area contract). */
async function demo(s: School, name: string) {
  const [d] = await sequelize.query<{ id: string }>(`INSERT INTO demos (school_id, name, owner_id) VALUES (:s, :name, :o) RETURNING id`, {
    replacements: { s: s.school.id, name, o: s.people.instructor.id },
    type: QueryTypes.SELECT,
  });
  const [r] = await sequelize.query<{ id: string }>(
    `INSERT INTO demo_revisions (demo_id, number, spec, created_by) VALUES (:d, 1, '{}'::jsonb, :o) RETURNING id`,
    { replacements: { d: d!.id, o: s.people.instructor.id }, type: QueryTypes.SELECT },
  );
  await sequelize.query(`UPDATE demos SET current_revision_id = :r WHERE id = :d`, { replacements: { r: r!.id, d: d!.id } });
  return { demoId: d!.id, demoRevisionId: r!.id };
}

describe("assignments", () => {
  it("assigning a briefing to a cohort writes one assignment.new mail per current member, in the same transaction", async () => {
    const s = await makeSchool("asg");
    fixedClock(new Date("2026-10-05T09:00:00Z"));
    const b = await briefing(s);
    actAs(s.as.instructor);
    const r = await createAssignmentAction({
      kind: "briefing",
      briefingId: b,
      demoId: "",
      cohortId: s.cohorts.a.id,
      studentIds: [],
      dueOn: "2026-10-10",
      note: "",
    });
    if (!r.ok) throw new Error(r.message);
    expect(r.data.mailed).toBe(3);
    const mails = await sequelize.query<{ recipient: string; subject: string; body: string }>(
      `SELECT recipient_id AS recipient, subject, body_text AS body FROM outbox WHERE kind = 'assignment.new' AND school_id = :s`,
      { replacements: { s: s.school.id }, type: QueryTypes.SELECT },
    );
    expect(mails.map((m) => m.recipient).sort()).toEqual(
      s.people.students
        .slice(0, 3)
        .map((p) => p.id)
        .sort(),
    );
    expect(mails[0]!.body).toContain("Speed stability either side of Vmd");

    // Completion across the cohort: nobody done yet; a cohort B student sees nothing.
    const table = await assignmentCompletion(s.as.instructor, r.data.ids[0]!);
    expect(table!.rows.map((x) => x.done)).toEqual([false, false, false]);
    expect(await listAssignmentsForStudent(s.school.id, s.people.students[3]!.id)).toEqual([]);
    expect(await assignmentCompletion(s.as.instructor2, r.data.ids[0]!)).toBeNull();
  });

  it("an instructor cannot assign to a cohort they do not lead; a bad student id leaves zero rows and zero mails", async () => {
    const s = await makeSchool("asgx");
    const other = await makeSchool("asgx2");
    fixedClock(new Date("2026-10-05T09:00:00Z"));
    const b = await briefing(s);
    actAs(s.as.instructor2);
    const refused = await createAssignmentAction({ kind: "briefing", briefingId: b, cohortId: s.cohorts.a.id, dueOn: "2026-10-10" });
    expect(refused).toMatchObject({ ok: false, status: 403 });
    expect(refused).toMatchObject({ field: "cohortId", message: expect.stringMatching(/^Cohort: /) });
    actAs(s.as.chief);
    const mixed = await createAssignmentAction({
      kind: "briefing",
      briefingId: b,
      studentIds: [s.people.students[0]!.id, other.people.students[0]!.id],
      dueOn: "2026-10-10",
    });
    expect(mixed).toMatchObject({ ok: false, status: 404 });
    const past = await createAssignmentAction({ kind: "briefing", briefingId: b, cohortId: s.cohorts.a.id, dueOn: "2026-10-04" });
    expect(past).toMatchObject({ ok: false, status: 400 });
    expect(past).toMatchObject({ field: "dueOn", message: expect.stringMatching(/^Due date: /) });
    const nodate = await createAssignmentAction({ kind: "briefing", briefingId: b, cohortId: s.cohorts.a.id, dueOn: "2026-02-30" });
    expect(nodate).toMatchObject({ ok: false, status: 400 });
    expect(await count(`SELECT count(*)::int AS n FROM assignments WHERE school_id = :s`, { s: s.school.id })).toBe(0);
    expect(await count(`SELECT count(*)::int AS n FROM outbox WHERE school_id = :s`, { s: s.school.id })).toBe(0);
    actAs(s.as.student);
    expect(await createAssignmentAction({ kind: "briefing", briefingId: b, cohortId: s.cohorts.a.id, dueOn: "2026-10-10" })).toMatchObject({
      ok: false,
      status: 403,
    });
  });

  it("overdue is derived from the due date and the school's calendar, not UTC's", async () => {
    const s = await makeSchool("asgtz");
    const clock = fixedClock(new Date("2026-10-05T09:00:00Z"));
    const b = await briefing(s);
    actAs(s.as.instructor);
    const r = await createAssignmentAction({ kind: "briefing", briefingId: b, cohortId: s.cohorts.a.id, dueOn: "2026-10-10" });
    if (!r.ok) throw new Error(r.message);
    const student = s.people.students[0]!.id;
    const overdue = async () => (await listAssignmentsForStudent(s.school.id, student))[0]!.overdue;

    // Europe/London is on summer time (UTC+1) until 25 October 2026 (common practice: EU rule, last Sunday of October).
    clock.set(new Date("2026-10-10T22:59:00Z")); // 23:59 on the 10th in London: due today, not overdue
    expect(await overdue()).toBe(false);
    clock.set(new Date("2026-10-10T23:01:00Z")); // 00:01 on the 11th in London, still the 10th in UTC
    expect(await overdue()).toBe(true);

    // The same instant in a school in Auckland (UTC+13 in October, NZ summer time) is already later.
    await sequelize.query(`UPDATE schools SET time_zone = 'Pacific/Auckland' WHERE id = :s`, { replacements: { s: s.school.id } });
    clock.set(new Date("2026-10-10T10:59:00Z")); // 23:59 on the 10th in Auckland
    expect(await overdue()).toBe(false);
    clock.set(new Date("2026-10-10T11:01:00Z")); // 00:01 on the 11th in Auckland, 12:01 on the 10th in London
    expect(await overdue()).toBe(true);

    // Done is never overdue; the student may undo it; another cohort's student cannot touch it.
    actAs(s.as.student);
    expect(await setAssignmentDoneAction({ assignmentId: r.data.ids[0], done: true })).toMatchObject({ ok: true });
    expect((await listAssignmentsForStudent(s.school.id, student))[0]).toMatchObject({ done: true, overdue: false });
    actAs(s.as.otherStudent);
    expect(await setAssignmentDoneAction({ assignmentId: r.data.ids[0], done: true })).toMatchObject({ ok: false, status: 404 });
    actAs(s.as.instructor);
    expect(await setAssignmentDoneAction({ assignmentId: r.data.ids[0], done: true })).toMatchObject({ ok: false, status: 403 });
    const table = await assignmentCompletion(s.as.instructor, r.data.ids[0]!);
    expect(table!.rows.filter((x) => x.done).map((x) => x.studentId)).toEqual([student]);
    expect(table!.rows.filter((x) => x.overdue)).toHaveLength(2);
  });

  it("lists demos assigned directly and through an assigned briefing, for that student only", async () => {
    const s = await makeSchool("asgdemo");
    fixedClock(new Date("2026-10-05T09:00:00Z"));
    const direct = await demo(s, "Drag polar of the Larkhollow trainer");
    const viaBriefing = await demo(s, "Gust either side of Vmd");
    const unassigned = await demo(s, "Not assigned");
    const b = await briefing(s, [viaBriefing.demoRevisionId]);
    actAs(s.as.instructor);
    expect(
      await createAssignmentAction({ kind: "demo", demoId: direct.demoId, studentIds: [s.people.students[0]!.id], dueOn: "2026-10-08" }),
    ).toMatchObject({ ok: true });
    expect(await createAssignmentAction({ kind: "briefing", briefingId: b, cohortId: s.cohorts.a.id, dueOn: "2026-10-09" })).toMatchObject({
      ok: true,
    });

    const mine = await listAssignedDemosForStudent(s.school.id, s.people.students[0]!.id);
    expect(mine.map((d) => [d.name, d.demoRevisionId, d.dueOn, d.viaBriefingTitle])).toEqual([
      ["Drag polar of the Larkhollow trainer", direct.demoRevisionId, "2026-10-08", null],
      ["Gust either side of Vmd", viaBriefing.demoRevisionId, "2026-10-09", "Speed stability either side of Vmd"],
    ]);
    expect(await isDemoAssignedToStudent(s.school.id, viaBriefing.demoId, s.people.students[1]!.id)).toBe(true);
    expect(await isDemoAssignedToStudent(s.school.id, direct.demoId, s.people.students[1]!.id)).toBe(false);
    expect(await isDemoAssignedToStudent(s.school.id, unassigned.demoId, s.people.students[0]!.id)).toBe(false);
    expect(await isDemoAssignedToStudent(s.school.id, viaBriefing.demoId, s.people.students[3]!.id)).toBe(false);
  });
});
