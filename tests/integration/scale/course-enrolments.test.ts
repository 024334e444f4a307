import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { generateScale } from "@/db/seed/scale";
import { activeEnrolmentsPage, ENROLMENTS_PAGE_SIZE } from "@/db/access/syllabus/enrolments";
import { enrolmentListQuerySchema } from "@/lib/syllabus/schema";
import { makeSchool, closeDb } from "@/tests/helpers/factories";
import { countQueries } from "@/tests/helpers/query-count";

// The Syllabus revisions page lists a course's active enrolments (each with its Move control) a
// page at a time: it printed every one (13.5 MB of HTML for 10,000 students). The pages read in
// sequence hold exactly one ORDER BY over all of them; the revision and a part of the student's
// name narrow before paging; a page costs the same number of queries at 20 and at 80 students.

type School = Awaited<ReturnType<typeof makeSchool>>;
let s: School;
afterAll(closeDb);
beforeAll(async () => {
  s = await makeSchool("course-enrolments");
});

const sql = <T extends object>(query: string, replacements: Record<string, unknown> = {}) =>
  sequelize.query<T>(query, { replacements: { s: s.school.id, ...replacements }, type: QueryTypes.SELECT });

async function allPages(filter: { name?: string; revisionId?: string } = {}) {
  const first = await activeEnrolmentsPage(s.school.id, s.course.id, filter);
  const rows = [...first.rows];
  for (let page = 2; (page - 1) * first.pageSize < first.total; page++) {
    const next = await activeEnrolmentsPage(s.school.id, s.course.id, filter, { page });
    expect(next.rows.length).toBeLessThanOrEqual(first.pageSize);
    rows.push(...next.rows);
  }
  expect(rows.length).toBe(first.total);
  return rows;
}

it("reads a page with the same number of queries at 20 and at 80 generated students", async () => {
  await generateScale(20, { schoolId: s.school.id });
  const read = () => activeEnrolmentsPage(s.school.id, s.course.id);
  await read();
  const small = await countQueries(read);
  await generateScale(60, { schoolId: s.school.id });
  const large = await countQueries(read);
  expect(large).toBe(small);
  expect(small).toBeGreaterThan(0);
  const page = await read();
  expect(page.total).toBeGreaterThan(ENROLMENTS_PAGE_SIZE);
  expect(page.rows).toHaveLength(ENROLMENTS_PAGE_SIZE);
});

it("holds, page after page, every active enrolment of the course once, by name then id", async () => {
  const reference = await sql<{ id: string }>(
    `SELECT e.id FROM enrolments e JOIN people p ON p.id = e.student_id
      WHERE e.course_id = :c AND e.status = 'active' ORDER BY p.name, e.id`,
    { c: s.course.id },
  );
  const paged = await allPages();
  expect(paged.map((r) => r.enrolmentId)).toEqual(reference.map((r) => r.id));
  expect(paged.every((r) => r.revisionId === s.revision.id && r.revisionNumber === 1)).toBe(true);
});

it("narrows to one revision and to a part of the student's name before paging", async () => {
  // two enrolments moved to a second revision row written directly (this test is about reading)
  const [rev2] = await sql<{ id: string }>(
    `INSERT INTO syllabus_revisions (course_id, number, change_note) VALUES (:c, 2, 'second') RETURNING id`,
    { c: s.course.id },
  );
  const all = await allPages();
  const moved = all.slice(0, 2).map((r) => r.enrolmentId);
  await sql(`UPDATE enrolments SET revision_id = :r WHERE id IN (:ids)`, { r: rev2!.id, ids: moved });
  const onTwo = await allPages({ revisionId: rev2!.id });
  expect(onTwo.map((r) => r.enrolmentId).sort()).toEqual([...moved].sort());
  expect(onTwo.every((r) => r.revisionNumber === 2)).toBe(true);
  expect((await allPages({ revisionId: s.revision.id })).length).toBe(all.length - 2);
  const part = all[all.length - 1]!.studentName.slice(-5);
  const named = await allPages({ name: part.toUpperCase() });
  expect(named.map((r) => r.enrolmentId)).toEqual(
    all.filter((r) => r.studentName.toLowerCase().includes(part.toLowerCase())).map((r) => r.enrolmentId),
  );
  expect(named.length).toBeGreaterThan(0);
  expect((await activeEnrolmentsPage(s.school.id, s.course.id, { name: "_" })).total).toBe(0);
});

it("refuses a bad query string naming the field", () => {
  const bad = enrolmentListQuerySchema.safeParse({ revision: "nope" });
  expect(bad.success).toBe(false);
  expect(bad.error!.issues[0]!.path).toEqual(["revision"]);
  const page = enrolmentListQuerySchema.safeParse({ page: "0" });
  expect(page.error!.issues[0]!.path).toEqual(["page"]);
  expect(enrolmentListQuerySchema.safeParse({ other: "x" }).success).toBe(false);
  expect(enrolmentListQuerySchema.parse({ name: " Quill ", revision: "", page: "2" })).toEqual({ name: "Quill", page: 2 });
});
