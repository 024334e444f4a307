import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { generateScale } from "@/db/seed/scale";
import { progressStudentsPage } from "@/db/access/records/student-list";
import { recordStudentsPage } from "@/db/access/records/record-students-page";
import { groundLogStudentsPage } from "@/db/access/ground-log/visible-students";
import { STUDENTS_PAGE_SIZE, type StudentsPage } from "@/db/access/shared/students-page";
import { visibleStudentIds } from "@/db/access/shared/student-scope";
import { todayFocusList, FOCUS_SHOWN } from "@/db/access/today/focus-list";
import { cohortsTop, listCohorts } from "@/db/access/cohorts/list-cohorts";
import { makeSchool, closeDb } from "@/tests/helpers/factories";

// The lists that grow with the school (the Progress map list, the Ground log's student list, the
// Today lists of cohorts and students) show a bounded number of rows, read with the same number of
// queries at 20 and at 60 generated students, and the pages of a paged list hold every student once.

type School = Awaited<ReturnType<typeof makeSchool>>;
let s: School;

beforeAll(async () => {
  s = await makeSchool("lists");
});
afterAll(closeDb);

async function countQueries(work: () => Promise<unknown>): Promise<number> {
  const spy = jest.spyOn(sequelize, "query");
  try {
    await work();
    return spy.mock.calls.length;
  } finally {
    spy.mockRestore();
  }
}

/** Every page of a paged list, in order. */
async function allPages(read: (page: number) => Promise<StudentsPage>): Promise<string[]> {
  const first = await read(1);
  const ids = first.rows.map((r) => r.id);
  for (let page = 2; (page - 1) * first.pageSize < first.total; page++) ids.push(...(await read(page)).rows.map((r) => r.id));
  expect(ids.length).toBe(first.total);
  return ids;
}

const LISTS = {
  "Progress map list, chief": () => progressStudentsPage(s.as.chief),
  "Progress map list, instructor": () => progressStudentsPage(s.as.instructor),
  "Ground log students, chief": () => groundLogStudentsPage(s.as.chief),
  "Records list, instructor": () => recordStudentsPage(s.as.instructor),
};

async function measure() {
  const out: Record<string, { queries: number; shown: number; total: number }> = {};
  for (const [name, read] of Object.entries(LISTS)) {
    await read();
    const queries = await countQueries(read);
    const r = await read();
    out[name] = { queries, shown: r.rows.length, total: r.total };
  }
  for (const who of ["chief", "instructor", "instructor2"] as const) {
    const read = () => todayFocusList(s.as[who]);
    await read();
    const queries = await countQueries(read);
    const r = await read();
    out[`Today list, ${who}`] = { queries, shown: r.rows.length, total: r.total };
  }
  return out;
}

it("shows a bounded number of rows with the same number of queries at 20 and at 60 students", async () => {
  await generateScale(20, { schoolId: s.school.id });
  const small = await measure();
  await generateScale(40, { schoolId: s.school.id });
  const large = await measure();
  for (const name of Object.keys(large)) {
    expect(large[name]!.queries).toBe(small[name]!.queries);
    expect(large[name]!.queries).toBeGreaterThan(0);
    const bound = name.startsWith("Today") ? FOCUS_SHOWN : STUDENTS_PAGE_SIZE;
    for (const at of [small, large]) expect(at[name]!.shown).toBe(Math.min(at[name]!.total, bound));
  }
  // the chief's lists count every generated student and show one page of them
  for (const name of ["Progress map list, chief", "Ground log students, chief"]) {
    expect(large[name]!.total).toBeGreaterThanOrEqual(small[name]!.total + 40);
    expect(large[name]!.shown).toBe(STUDENTS_PAGE_SIZE);
  }
  // an instructor leads half the generated cohorts: their Today names FOCUS_SHOWN students and counts the rest
  const taught = Math.max(large["Today list, instructor"]!.total, large["Today list, instructor2"]!.total);
  expect(taught).toBeGreaterThan(FOCUS_SHOWN);
  expect(Math.max(large["Today list, instructor"]!.shown, large["Today list, instructor2"]!.shown)).toBe(FOCUS_SHOWN);
});

it("pages the Progress map list: the pages hold every student the caller may see once, and the filters apply before paging", async () => {
  for (const who of ["chief", "instructor", "instructor2"] as const) {
    const ids = await allPages((page) => progressStudentsPage(s.as[who], {}, { page }));
    expect(new Set(ids).size).toBe(ids.length);
    expect([...ids].sort()).toEqual((await visibleStudentIds(s.as[who], "progress")).sort());
  }
  const first = await progressStudentsPage(s.as.chief);
  const cohort = first.cohorts[first.cohorts.length - 1]!;
  const inCohort = await allPages((page) => progressStudentsPage(s.as.chief, { cohortId: cohort.id }, { page }));
  const members = await sequelize.query<{ id: string }>(
    `SELECT m.student_id AS id FROM cohort_memberships m JOIN people p ON p.id = m.student_id JOIN active_enrolments e ON e.student_id = p.id
      WHERE m.cohort_id = :c AND m.to_date IS NULL AND p.active`,
    { replacements: { c: cohort.id }, type: QueryTypes.SELECT },
  );
  expect(inCohort.sort()).toEqual(members.map((m) => m.id).sort());
  const one = first.rows[first.rows.length - 1]!;
  const byName = await progressStudentsPage(s.as.chief, { name: one.name.slice(2).toLowerCase() });
  expect(byName.rows.map((r) => r.id)).toContain(one.id);
  expect(byName.rows.every((r) => r.name.toLowerCase().includes(one.name.slice(2).toLowerCase()))).toBe(true);
  // a sponsor sees only the students who share their progress with them
  const sponsor = await allPages((page) => progressStudentsPage(s.as.sponsor, {}, { page }));
  expect(sponsor.sort()).toEqual((await visibleStudentIds(s.as.sponsor, "progress")).sort());
});

it("pages the Ground log's student list: every student account once, cohort names for staff only", async () => {
  const ids = await allPages((page) => groundLogStudentsPage(s.as.chief, {}, { page }));
  const accounts = await sequelize.query<{ id: string }>(`SELECT id FROM people WHERE school_id = :s AND 'student' = ANY(roles)`, {
    replacements: { s: s.school.id },
    type: QueryTypes.SELECT,
  });
  expect([...ids].sort()).toEqual(accounts.map((a) => a.id).sort());
  const chiefFirst = await groundLogStudentsPage(s.as.chief);
  expect(chiefFirst.rows.every((r) => r.cohortName !== null)).toBe(true); // every generated and factory student is in a cohort
  await sequelize.query(`UPDATE sponsor_links SET shares_attendance = true WHERE sponsor_id = :sp`, {
    replacements: { sp: s.people.sponsor.id },
  });
  const sponsor = await groundLogStudentsPage(s.as.sponsor);
  expect(sponsor.rows.map((r) => r.id)).toEqual([s.people.students[0]!.id]);
  expect(sponsor.rows[0]!.cohortName).toBeNull();
  expect(sponsor.cohorts).toEqual([]);
  expect((await groundLogStudentsPage(s.as.sponsor, { cohortId: s.cohorts.a.id })).total).toBe(0);
});

it("Today names the first cohorts and taught students and counts them all, as the full lists would", async () => {
  const chief = await todayFocusList(s.as.chief);
  const cohorts = await listCohorts(s.school.id);
  expect(chief.total).toBe(cohorts.length);
  expect(chief.rows.map((r) => r.id)).toEqual(cohorts.slice(0, FOCUS_SHOWN).map((c) => c.id));
  const top = await cohortsTop(s.school.id, { leadInstructorId: s.people.instructor.id }, 2);
  const led = await listCohorts(s.school.id, { leadInstructorId: s.people.instructor.id });
  expect(top.total).toBe(led.length);
  expect(top.rows).toEqual(led.slice(0, 2));
  for (const who of ["instructor", "instructor2"] as const) {
    const list = await todayFocusList(s.as[who]);
    const members = await sequelize.query<{ n: number }>(
      `SELECT count(*)::int AS n FROM cohort_memberships m JOIN cohorts c ON c.id = m.cohort_id
        WHERE c.lead_instructor_id = :me AND m.to_date IS NULL`,
      { replacements: { me: s.people[who].id }, type: QueryTypes.SELECT },
    );
    expect(list.total).toBe(members[0]!.n);
    if (list.total > FOCUS_SHOWN) expect(list.more?.href).toBe("/records");
  }
});
