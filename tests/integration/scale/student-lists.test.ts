import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { generateScale, STUDENTS_PER_COHORT } from "@/db/seed/scale";
import { COHORT_CHOICES_MAX } from "@/lib/records/schema";
import { progressStudentsPage } from "@/db/access/records/student-list";
import { recordStudentsPage } from "@/db/access/records/record-students-page";
import { groundLogStudentsPage } from "@/db/access/ground-log/visible-students";
import { STUDENTS_PAGE_SIZE, type StudentsPage } from "@/db/access/shared/students-page";
import { visibleStudentIds } from "@/db/access/shared/student-scope";
import { todayFocusList, FOCUS_SHOWN } from "@/db/access/today/focus-list";
import { cohortsTop, listCohorts, listCohortMembers } from "@/db/access/cohorts/list-cohorts";
import { peoplePage, PEOPLE_PAGE_SIZE } from "@/db/access/people/people-page";
import { cohortRosters, ROSTERS_SHOWN } from "@/db/access/people/cohort-rosters";
import { letterLinksPage, LETTER_LINKS_PAGE_SIZE } from "@/db/access/mail/letter-links";
import { linkSponsor } from "@/db/access/cohorts/sponsor-links";
import { completionOverview } from "@/db/access/completion/completion-overview";
import { makeSchool, closeDb } from "@/tests/helpers/factories";
import { countQueries } from "@/tests/helpers/query-count";

// The lists that grow with the school (the Progress map list, the Ground log's student list, the
// Today lists of cohorts and students) show a bounded number of rows, read with the same number of
// queries at 20 and at 60 generated students, and the pages of a paged list hold every student once.

type School = Awaited<ReturnType<typeof makeSchool>>;
let s: School;

beforeAll(async () => {
  s = await makeSchool("lists");
});
afterAll(closeDb);

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
  const completion = () => completionOverview(s.as.chief);
  await completion();
  const c = await completion();
  out["End of training, in training"] = { queries: await countQueries(completion), shown: c.inTraining.length, total: c.inTrainingTotal };
  const people = () => peoplePage(s.school.id);
  await people();
  out["People, everyone"] = { queries: await countQueries(people), shown: (await people()).rows.length, total: (await people()).total };
  const rosters = () => cohortRosters(s.school.id, {}, ROSTERS_SHOWN);
  await rosters();
  const r = await rosters();
  out["People, cohort rosters"] = { queries: await countQueries(rosters), shown: r.rosters.length, total: r.total };
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
    const bound = name.startsWith("Today")
      ? FOCUS_SHOWN
      : name === "People, everyone"
        ? PEOPLE_PAGE_SIZE
        : name === "People, cohort rosters"
          ? ROSTERS_SHOWN
          : STUDENTS_PAGE_SIZE;
    for (const at of [small, large]) expect(at[name]!.shown).toBe(Math.min(at[name]!.total, bound));
  }
  // the chief's lists count every generated student and show one page of them
  for (const name of ["Progress map list, chief", "Ground log students, chief", "People, everyone", "End of training, in training"]) {
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

it("pages the People page: everyone once across the pages, filters before paging, the rosters of the first cohorts in one read", async () => {
  const first = await peoplePage(s.school.id);
  const ids = first.rows.map((r) => r.id);
  for (let page = 2; (page - 1) * PEOPLE_PAGE_SIZE < first.total; page++)
    ids.push(...(await peoplePage(s.school.id, {}, { page })).rows.map((r) => r.id));
  const everyone = await sequelize.query<{ id: string }>(`SELECT id FROM people WHERE school_id = :s`, {
    replacements: { s: s.school.id },
    type: QueryTypes.SELECT,
  });
  expect([...ids].sort()).toEqual(everyone.map((p) => p.id).sort());
  const instructors = await peoplePage(s.school.id, { role: "instructor" });
  const withRole = await sequelize.query<{ id: string }>(`SELECT id FROM people WHERE school_id = :s AND 'instructor' = ANY(roles)`, {
    replacements: { s: s.school.id },
    type: QueryTypes.SELECT,
  });
  expect(instructors.rows.map((p) => p.id)).toEqual(expect.arrayContaining([s.people.instructor.id, s.people.instructor2.id]));
  expect(instructors.rows.map((p) => p.id).sort()).toEqual(withRole.map((p) => p.id).sort());
  const byMail = await peoplePage(s.school.id, { q: s.people.sponsor.email.toUpperCase() });
  expect(byMail.rows.map((p) => p.id)).toEqual([s.people.sponsor.id]);
  expect((await peoplePage(s.school.id, { q: "_" })).total).toBe(0); // LIKE's wildcards are taken literally
  const two = await cohortRosters(s.school.id, {}, 2);
  const cohorts = await listCohorts(s.school.id);
  expect(two.total).toBe(cohorts.length);
  expect(two.rosters.map((r) => r.cohort)).toEqual(cohorts.slice(0, 2));
  const key = (m: { studentId: string; fromDate: string }) => `${m.studentId} ${m.fromDate}`;
  for (const { cohort, members } of two.rosters) {
    const full = await listCohortMembers(cohort.id, true);
    expect(members.length).toBeGreaterThan(0);
    expect([...members].sort((a, b) => key(a).localeCompare(key(b)))).toEqual([...full].sort((a, b) => key(a).localeCompare(key(b))));
  }
});

it("pages the Weekly letters' sponsor links: the same queries and at most a page of rows from 1 link to 61, every link once across the pages", async () => {
  const read = () => letterLinksPage(s.school.id);
  await read();
  const before = { queries: await countQueries(read), page: await read() };
  expect(before.page.total).toBeGreaterThanOrEqual(1);
  const students = await sequelize.query<{ id: string }>(
    `SELECT id FROM people WHERE school_id = :s AND 'student' = ANY(roles) AND active
        AND id NOT IN (SELECT student_id FROM sponsor_links WHERE sponsor_id = :sp) ORDER BY name LIMIT 60`,
    { replacements: { s: s.school.id, sp: s.people.sponsor.id }, type: QueryTypes.SELECT },
  );
  expect(students).toHaveLength(60);
  for (const st of students) await linkSponsor({ sponsorId: s.people.sponsor.id, studentId: st.id });
  const after = { queries: await countQueries(read), page: await read() };
  expect(after.queries).toBe(before.queries);
  expect(after.page.total).toBe(before.page.total + 60);
  expect(after.page.rows).toHaveLength(LETTER_LINKS_PAGE_SIZE);
  const keys: string[] = [];
  for (let page = 1; (page - 1) * LETTER_LINKS_PAGE_SIZE < after.page.total; page++)
    keys.push(...(await letterLinksPage(s.school.id, {}, { page })).rows.map((l) => `${l.sponsorId}:${l.studentId}`));
  expect(new Set(keys).size).toBe(after.page.total);
  expect(keys).toContain(`${s.people.sponsor.id}:${students[59]!.id}`);
  const one = await sequelize.query<{ name: string }>(`SELECT name FROM people WHERE id = :id`, {
    replacements: { id: students[0]!.id },
    type: QueryTypes.SELECT,
  });
  const byName = await letterLinksPage(s.school.id, { name: one[0]!.name.toUpperCase() });
  expect(byName.rows.map((l) => l.studentId)).toContain(students[0]!.id);
  expect(
    byName.rows.every(
      (l) =>
        l.studentName.toUpperCase().includes(one[0]!.name.toUpperCase()) ||
        l.sponsorName.toUpperCase().includes(one[0]!.name.toUpperCase()),
    ),
  ).toBe(true);
});

it("pages the End of training's students in training: every student with an active enrolment once, with their course and enrolment date", async () => {
  const first = await completionOverview(s.as.chief);
  const rows = [...first.inTraining];
  for (let page = 2; (page - 1) * first.pageSize < first.inTrainingTotal; page++)
    rows.push(...(await completionOverview(s.as.chief, {}, { page })).inTraining);
  const enrolled = await sequelize.query<{ id: string; code: string; on: string }>(
    `SELECT e.student_id AS id, co.code, e.enrolled_on::text AS "on" FROM active_enrolments e JOIN people p ON p.id = e.student_id
       JOIN courses co ON co.id = e.course_id WHERE p.school_id = :s`,
    { replacements: { s: s.school.id }, type: QueryTypes.SELECT },
  );
  expect(rows.map((r) => r.studentId).sort()).toEqual(enrolled.map((e) => e.id).sort());
  const byId = new Map(enrolled.map((e) => [e.id, e]));
  for (const r of rows) expect([r.courseCode, r.enrolledOn]).toEqual([byId.get(r.studentId)!.code, byId.get(r.studentId)!.on]);
  const inB = await completionOverview(s.as.chief, { cohortId: s.cohorts.b.id });
  expect(inB.inTraining.map((r) => r.studentId).sort()).toEqual(
    s.people.students
      .slice(3, 6)
      .map((p) => p.id)
      .sort(),
  );
});

it("offers the cohorts as choices up to COHORT_CHOICES_MAX and, beyond, filters by a part of the cohort's name", async () => {
  const big = await makeSchool("many-cohorts");
  const { tag } = await generateScale(STUDENTS_PER_COHORT * (COHORT_CHOICES_MAX + 1), { schoolId: big.school.id });
  const first = await recordStudentsPage(big.as.chief);
  // 51 generated cohorts and the factory's two: the choices stop one past the bound, which tells the form to ask for a name
  expect(first.cohorts).toHaveLength(COHORT_CHOICES_MAX + 1);
  const name = `Scale ${tag} C0007`;
  const [cohort] = await sequelize.query<{ id: string }>(`SELECT id FROM cohorts WHERE school_id = :s AND name = :n`, {
    replacements: { s: big.school.id, n: name },
    type: QueryTypes.SELECT,
  });
  const byName = await allPages((page) => recordStudentsPage(big.as.chief, { cohortName: "c0007" }, { page }));
  const byId = await allPages((page) => recordStudentsPage(big.as.chief, { cohortId: cohort!.id }, { page }));
  expect(byName).toHaveLength(STUDENTS_PER_COHORT);
  expect(byName.sort()).toEqual(byId.sort());
  // LIKE wildcards are taken literally; no cohort has a % in its name
  expect((await recordStudentsPage(big.as.chief, { cohortName: "%" })).total).toBe(0);
});
