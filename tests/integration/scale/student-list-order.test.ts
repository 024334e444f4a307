import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { generateScale } from "@/db/seed/scale";
import { createPerson } from "@/db/access/people/create-person";
import { addToCohort } from "@/db/access/cohorts/memberships";
import { enrol } from "@/db/access/cohorts/enrol";
import { studentsPage, type ListedStudent, type StudentsFilter, type StudentsPageOptions } from "@/db/access/shared/students-page";
import { studentScopeSql, type Caller, type ScopePurpose } from "@/db/access/shared/student-scope";
import { containsPattern } from "@/db/access/shared/like";
import { STUDENT_ROLES } from "@/lib/auth/account-roles";
import { makeSchool, closeDb, testPasswordHash } from "@/tests/helpers/factories";
import { makeBriefing, makeSession } from "@/tests/integration/mail/helpers";

// The student pager reads a page from the school's cohorts in name order (and the students without
// a named cohort after them), not from one ORDER BY over every student in scope. Read page after
// page, its rows must be the rows, in the order, of that single ORDER BY, which this test keeps as
// the reference: for each caller, purpose, filter and option, with students with and without a
// current cohort, equal names, deactivated accounts, accounts without an enrolment, a membership
// ended, a student taught through a session only.

type School = Awaited<ReturnType<typeof makeSchool>>;
let s: School;
let generatedCohort: { id: string; name: string };
let attendedCohortId: string;

/** The single ORDER BY over every student the caller may see (the pager's rows query before it paged by cohort). */
async function reference(
  caller: Caller,
  purpose: ScopePurpose,
  filter: StudentsFilter,
  opts: StudentsPageOptions,
): Promise<ListedStudent[]> {
  const scope = studentScopeSql(caller, purpose, "p.id");
  const enrolled = (opts.who ?? "enrolled") === "enrolled";
  const enrolledSql = enrolled ? "AND EXISTS (SELECT 1 FROM enrolments e WHERE e.student_id = p.id AND e.status = 'active')" : "";
  const cohortShown = opts.cohortToStaffOnly ? `(${scope.staffSql})` : "TRUE";
  const who = enrolled && !opts.includeInactive ? "p.active" : "p.roles && ARRAY[:studentRoles]::text[]";
  return sequelize.query<ListedStudent>(
    `SELECT p.id, p.name, CASE WHEN ${cohortShown} THEN c.name END AS "cohortName"
       FROM people p
       LEFT JOIN cohort_memberships m ON m.student_id = p.id AND m.to_date IS NULL LEFT JOIN cohorts c ON c.id = m.cohort_id
      WHERE p.school_id = :schoolId AND ${who} AND ${scope.sql} ${enrolledSql}
        AND (CAST(:cohortId AS uuid) IS NULL OR (m.cohort_id = CAST(:cohortId AS uuid) AND ${cohortShown}))
        AND (CAST(:cohortName AS text) IS NULL OR (c.name ILIKE CAST(:cohortName AS text) AND ${cohortShown}))
        AND (CAST(:name AS text) IS NULL OR p.name ILIKE CAST(:name AS text))
      ORDER BY 3 NULLS LAST, p.name, p.id`,
    {
      replacements: {
        schoolId: caller.schoolId,
        studentRoles: STUDENT_ROLES,
        ...scope.replacements,
        cohortId: filter.cohortId ?? null,
        name: filter.name ? containsPattern(filter.name) : null,
        cohortName: filter.cohortName ? containsPattern(filter.cohortName) : null,
      },
      type: QueryTypes.SELECT,
    },
  );
}

/** Every page of the pager, read in sequence, concatenated; checks each page's total and size on the way. */
async function pagedRows(caller: Caller, purpose: ScopePurpose, filter: StudentsFilter, opts: StudentsPageOptions, pageSize: number) {
  const rows: ListedStudent[] = [];
  for (let page = 1; ; page++) {
    const p = await studentsPage(caller, purpose, filter, { ...opts, page, pageSize });
    expect(p.rows.length).toBeLessThanOrEqual(pageSize);
    rows.push(...p.rows.map((r) => ({ id: r.id, name: r.name, cohortName: r.cohortName })));
    if (page * pageSize >= p.total) {
      expect(rows.length).toBe(p.total);
      return rows;
    }
  }
}

beforeAll(async () => {
  s = await makeSchool("order");
  // 60 generated students in three cohorts (names repeat across them), led by the school's instructors
  await generateScale(60, { schoolId: s.school.id });
  const hash = await testPasswordHash();
  const person = (name: string) =>
    createPerson(
      {
        schoolId: s.school.id,
        name,
        email: `${name.toLowerCase().replace(/\W+/g, ".")}.${Math.random().toString(36).slice(2, 8)}@chalkwing.test`,
        roles: ["student"],
        passwordHash: hash,
      },
      undefined,
    );
  const enrolIn = (id: string) => enrol({ studentId: id, courseId: s.course.id, revisionId: s.revision.id, enrolledOn: "2026-08-30" });
  // without a current cohort: names before, among and after the cohort students' names, two alike
  for (const name of ["Aaron Nocohort", "Student 2", "Student 2", "Zora Nocohort", "Mia Nocohort"]) await enrolIn((await person(name)).id);
  // two alike within a cohort (ordered by id), one deactivated, one account never enrolled
  for (const name of ["Student 5", "Student 5"]) {
    const p = await person(name);
    await addToCohort({ cohortId: s.cohorts.b.id, studentId: p.id, fromDate: "2026-09-01" });
    await enrolIn(p.id);
  }
  const inactive = await person("Inactive Inga");
  await addToCohort({ cohortId: s.cohorts.a.id, studentId: inactive.id, fromDate: "2026-09-01" });
  await enrolIn(inactive.id);
  await sequelize.query(`UPDATE people SET active = false WHERE id = :id`, { replacements: { id: inactive.id } });
  const notEnrolled = await person("Never Enrolled");
  await addToCohort({ cohortId: s.cohorts.a.id, studentId: notEnrolled.id, fromDate: "2026-09-01" });
  await person("Never Enrolled Either");
  // the first instructor's cohort A: one membership ended (still taught by them, now without a cohort)
  await sequelize.query(
    `UPDATE cohort_memberships SET to_date = '2026-09-15', end_reason = 'left the course' WHERE student_id = :id AND to_date IS NULL`,
    {
      replacements: { id: s.people.students[1]!.id },
    },
  );
  // a generated student the first instructor teaches only in a session
  const [other] = await sequelize.query<{ id: string; cohortId: string }>(
    `SELECT m.student_id AS id, m.cohort_id AS "cohortId" FROM cohort_memberships m JOIN cohorts c ON c.id = m.cohort_id
      WHERE c.school_id = :s AND c.lead_instructor_id <> :i AND m.to_date IS NULL ORDER BY m.student_id LIMIT 1`,
    { replacements: { s: s.school.id, i: s.people.instructor.id }, type: QueryTypes.SELECT },
  );
  await makeSession(s, await makeBriefing(s, "Order briefing"), new Date("2026-10-01T09:00:00Z"), [other!.id]);
  attendedCohortId = other!.cohortId;
  const [cohort] = await sequelize.query<{ id: string; name: string }>(
    `SELECT c.id, c.name FROM cohorts c WHERE c.school_id = :s AND c.id NOT IN (:a, :b) ORDER BY c.name DESC LIMIT 1`,
    { replacements: { s: s.school.id, a: s.cohorts.a.id, b: s.cohorts.b.id }, type: QueryTypes.SELECT },
  );
  generatedCohort = cohort!;
  // the sponsor sees their student's progress and ground log
  await sequelize.query(
    `UPDATE sponsor_links SET shares_progress = true, shares_hours = true, shares_attendance = true WHERE sponsor_id = :sp`,
    {
      replacements: { sp: s.people.sponsor.id },
    },
  );
}, 120_000);
afterAll(closeDb);

type Case = [string, keyof School["as"], ScopePurpose, () => StudentsFilter, StudentsPageOptions];
const CASES: Case[] = [
  ["Records, chief", "chief", "records", () => ({}), {}],
  ["Records, instructor", "instructor", "records", () => ({}), {}],
  ["Records, second instructor", "instructor2", "records", () => ({}), {}],
  ["Progress map list, chief", "chief", "progress", () => ({}), {}],
  ["Progress map list, instructor", "instructor", "progress", () => ({}), {}],
  ["Progress map list, sponsor", "sponsor", "progress", () => ({}), {}],
  ["Progress map list, student", "student", "progress", () => ({}), {}],
  ["Ground log, chief", "chief", "groundlog", () => ({}), { who: "accounts", cohortToStaffOnly: true }],
  ["Ground log, instructor", "instructor", "groundlog", () => ({}), { who: "accounts", cohortToStaffOnly: true }],
  ["Ground log, sponsor", "sponsor", "groundlog", () => ({}), { who: "accounts", cohortToStaffOnly: true }],
  ["Ground log, student", "student", "groundlog", () => ({}), { who: "accounts", cohortToStaffOnly: true }],
  ["End of training, chief", "chief", "records", () => ({}), { includeInactive: true }],
  ["Records, chief, a cohort", "chief", "records", () => ({ cohortId: s.cohorts.b.id }), {}],
  ["Records, chief, a generated cohort", "chief", "records", () => ({ cohortId: generatedCohort.id }), {}],
  ["Records, instructor, another's cohort", "instructor", "records", () => ({ cohortId: attendedCohortId }), {}],
  ["Records, chief, part of a cohort's name", "chief", "records", () => ({ cohortName: generatedCohort.name.slice(-3).toLowerCase() }), {}],
  ["Records, chief, part of a student's name", "chief", "records", () => ({ name: "student" }), {}],
  ["Records, instructor, part of a student's name", "instructor", "records", () => ({ name: "a" }), {}],
  ["Records, chief, both names", "chief", "records", () => ({ name: "e", cohortName: generatedCohort.name.slice(0, 5) }), {}],
  ["Ground log, chief, a cohort", "chief", "groundlog", () => ({ cohortId: s.cohorts.a.id }), { who: "accounts", cohortToStaffOnly: true }],
  [
    "Ground log, sponsor, a cohort",
    "sponsor",
    "groundlog",
    () => ({ cohortId: s.cohorts.a.id }),
    { who: "accounts", cohortToStaffOnly: true },
  ],
  ["Ground log, chief, part of a name", "chief", "groundlog", () => ({ name: "never" }), { who: "accounts", cohortToStaffOnly: true }],
  ["End of training, chief, part of a cohort's name", "chief", "records", () => ({ cohortName: s.tag }), { includeInactive: true }],
];

it("has students with and without a current cohort in the school's list", async () => {
  const all = await reference(s.as.chief, "records", {}, {});
  expect(all.length).toBeGreaterThan(60);
  expect(all.filter((r) => r.cohortName === null).map((r) => r.name)).toEqual([
    "Aaron Nocohort",
    "Mia Nocohort",
    "Student 2",
    "Student 2",
    "Student 2",
    "Zora Nocohort",
  ]);
  const taught = await reference(s.as.instructor, "records", {}, {});
  expect(taught.filter((r) => r.cohortName === null).map((r) => r.id)).toEqual([s.people.students[1]!.id]);
});

it.each(CASES)(
  "%s: the pages read in sequence are the single ORDER BY's rows, in its order",
  async (_label, who, purpose, filter, opts) => {
    const caller = s.as[who];
    const expected = await reference(caller, purpose, filter(), opts);
    // 5000: one page beyond the first rows the pager reads by cohort (it then reads them by one ORDER BY)
    for (const pageSize of [7, 50, 5000]) expect(await pagedRows(caller, purpose, filter(), opts, pageSize)).toEqual(expected);
    // past the last page: no rows, the same total
    const beyond = await studentsPage(caller, purpose, filter(), { ...opts, page: Math.ceil(expected.length / 7) + 2, pageSize: 7 });
    expect(beyond.rows).toEqual([]);
    expect(beyond.total).toBe(expected.length);
  },
);

it("lists what each case is about (no case is empty by accident)", async () => {
  const sizes: Record<string, number> = {};
  for (const [label, who, purpose, filter, opts] of CASES) sizes[label] = (await reference(s.as[who], purpose, filter(), opts)).length;
  for (const label of Object.keys(sizes))
    if (label !== "Ground log, sponsor, a cohort") expect([label, sizes[label]! > 0]).toEqual([label, true]);
  expect(sizes["Ground log, sponsor, a cohort"]).toBe(0); // the cohort is named to staff only
  expect(sizes["End of training, chief"]).toBe(sizes["Records, chief"]! + 1); // the deactivated student
  expect(sizes["Ground log, chief"]).toBeGreaterThan(sizes["Records, chief"]!); // accounts not enrolled
  expect(sizes["Records, instructor, another's cohort"]).toBe(1); // the student taught in a session only
  expect(sizes["Records, instructor"]).toBeGreaterThan(1);
});
