import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { makeSchool, closeDb, actAs } from "@/tests/helpers/factories";
import { createBriefingAction } from "@/app/(app)/briefings/actions";
import { assignmentCompletion, staffAssignmentsPage, ASSIGNMENTS_PAGE_SIZE } from "@/db/access/assignments/staff-assignments";
import { countQueries } from "@/tests/helpers/query-count";

jest.mock("next/cache", () => ({ revalidatePath: jest.fn() }));

// The Assignments page's "Set so far" listed every assignment the caller may see (a school sets
// them every week, so it grew with the years), and one assignment's completion read that whole
// list to find it. Now a page of 50 (newest due first, then title, then id) is read in SQL with the
// completion counts for its rows only: the pages in sequence equal one ORDER BY over what the
// caller may see, two queries a page however many were set.

type School = Awaited<ReturnType<typeof makeSchool>>;
let s: School;
let briefingId: string;

const sql = <T extends object>(query: string, replacements: Record<string, unknown> = {}) =>
  sequelize.query<T>(query, { replacements: { s: s.school.id, ...replacements }, type: QueryTypes.SELECT });

beforeAll(async () => {
  s = await makeSchool("assignments-list");
  actAs(s.as.instructor);
  const r = await createBriefingAction({
    courseId: s.course.id,
    syllabusRevisionId: s.revision.id,
    title: "Power required and power available",
    objective: "Read Vmp off the power curve.",
    syllabusItemIds: [],
    elements: [{ title: "The curve", instructorActions: "Draw it.", studentActions: "Find Vmp.", minutes: 15 }],
    equipment: "",
    demoRevisionIds: [],
    completionStandard: "Finds Vmp.",
    handoutIds: [],
    changeNote: "",
  });
  if (!r.ok) throw new Error(r.message);
  briefingId = r.data.briefingId;
});
afterAll(async () => {
  actAs(null);
  await closeDb();
});

/**
 * `n` assignments written directly (this test is about reading them): to cohort A (led by the
 * instructor) and cohort B (led by instructor 2) in turn, set by each of them in turn, due on
 * days that repeat (so the title and the id decide ties), each with its students.
 */
async function addAssignments(n: number, tag: string) {
  await sql(
    `INSERT INTO assignments (school_id, kind, briefing_id, cohort_id, due_on, assigned_by)
     SELECT :s, 'briefing', :b, CASE WHEN i % 2 = 0 THEN CAST(:ca AS uuid) ELSE CAST(:cb AS uuid) END,
            DATE '2026-09-01' + (i % 9), CASE WHEN i % 3 = 0 THEN CAST(:i1 AS uuid) ELSE CAST(:i2 AS uuid) END
       FROM generate_series(1, :n) i`,
    { b: briefingId, ca: s.cohorts.a.id, cb: s.cohorts.b.id, i1: s.people.instructor.id, i2: s.people.instructor2.id, n },
  );
  // about half of the students have done each (who an assignment is for is the view assignment_students)
  await sql(
    `INSERT INTO assignment_completions (assignment_id, student_id, completed_at)
     SELECT v.assignment_id, v.student_id, now() FROM assignment_students v
      WHERE v.school_id = :s AND v.completed_at IS NULL AND get_byte(decode(md5(v.assignment_id::text || v.student_id::text), 'hex'), 0) % 2 = 0
     ON CONFLICT DO NOTHING`,
  );
  return tag;
}

async function allPages(caller: School["as"]["chief"]) {
  const first = await staffAssignmentsPage(caller);
  const rows = [...first.rows];
  for (let page = 2; (page - 1) * first.pageSize < first.total; page++) rows.push(...(await staffAssignmentsPage(caller, { page })).rows);
  expect(rows.length).toBe(first.total);
  return rows;
}

it("reads a page with the same number of queries for few assignments and many", async () => {
  await addAssignments(6, "few");
  const read = () => staffAssignmentsPage(s.as.chief);
  await read();
  const few = await countQueries(read);
  await addAssignments(114, "many");
  expect(await countQueries(read)).toBe(few);
  const page = await read();
  expect(page.total).toBe(120);
  expect(page.rows).toHaveLength(ASSIGNMENTS_PAGE_SIZE);
});

it("holds, page after page, what each caller may see, newest due first, then title, then id", async () => {
  const reference = (viewer: string | null) =>
    sql<{ id: string }>(
      `SELECT a.id FROM assignments a LEFT JOIN cohorts c ON c.id = a.cohort_id
        WHERE a.school_id = :s AND (CAST(:v AS uuid) IS NULL OR a.assigned_by = CAST(:v AS uuid) OR c.lead_instructor_id = CAST(:v AS uuid))
        ORDER BY a.due_on DESC, a.id`,
      { v: viewer },
    );
  // one briefing, so one title: the order is the due date, then the id
  const chief = await allPages(s.as.chief);
  expect(chief.map((r) => r.id)).toEqual((await reference(null)).map((r) => r.id));
  const instructor = await allPages(s.as.instructor);
  expect(instructor.map((r) => r.id)).toEqual((await reference(s.people.instructor.id)).map((r) => r.id));
  // the instructor sees cohort A's and those they set for cohort B, not instructor 2's for cohort B
  expect(instructor.length).toBeLessThan(chief.length);
  expect(instructor.length).toBeGreaterThan(60);
});

it("counts each row's students, done and overdue as the rows of assignment_students say", async () => {
  const { rows } = await staffAssignmentsPage(s.as.chief, { page: 2 });
  const [r] = await sql<{ students: number; done: number; overdue: number }>(
    `SELECT count(*)::int AS students, count(completed_at)::int AS done,
            count(*) FILTER (WHERE completed_at IS NULL AND due_on < (now() AT TIME ZONE 'Europe/London')::date)::int AS overdue
       FROM assignment_students WHERE assignment_id = :a`,
    { a: rows[0]!.id },
  );
  expect(rows[0]).toMatchObject({
    ...r,
    title: "Power required and power available",
    target: s.cohorts.a.name.length ? expect.any(String) : "",
  });
  expect(r!.students).toBeGreaterThan(0);
});

it("finds one assignment's completion by its id, for a caller who may see it only", async () => {
  const chief = await allPages(s.as.chief);
  const last = chief[chief.length - 1]!;
  const seen = await assignmentCompletion(s.as.chief, last.id);
  expect(seen?.assignment).toEqual(last);
  expect(seen?.rows.length).toBe(last.students);
  const notMine = (await allPages(s.as.chief)).find(
    (a) => a.cohortId === s.cohorts.b.id && a.assignedByName === s.people.instructor2.name,
  )!;
  expect(await assignmentCompletion(s.as.instructor, notMine.id)).toBeNull();
  expect(await assignmentCompletion(s.as.instructor2, notMine.id)).not.toBeNull();
});
