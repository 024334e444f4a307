import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { generateScale } from "@/db/seed/scale";
import { rosterPage } from "@/db/access/roster/roster-page";
import { cohortsOverview, COHORTS_PAGE_SIZE, MEMBERS_SHOWN } from "@/db/access/cohorts/cohorts-overview";
import { accountsPage, ACCOUNTS_PAGE_SIZE } from "@/db/access/people/accounts-page";
import { STUDENTS_PAGE_SIZE } from "@/db/access/shared/students-page";
import { makeSchool, closeDb } from "@/tests/helpers/factories";
import { PICKER_LIST_MAX } from "@/lib/directory/picker";
import { cohortChoices, searchCohorts } from "@/db/access/directory/cohorts";
import { countQueries } from "@/tests/helpers/query-count";

// The chief's lists of the whole school that used to show every row (the Roster, the Cohorts
// page's cohorts, Accounts and roles' staff and sponsors) show one page, read with the same number
// of queries at 20 and at 60+ generated students, and their pages together hold every row once.

type School = Awaited<ReturnType<typeof makeSchool>>;
let s: School;

beforeAll(async () => {
  s = await makeSchool("managed");
});
afterAll(closeDb);

/** Every page of a paged list, in order; the pages' sizes checked against the total. */
async function allPages<R>(read: (page: number) => Promise<{ rows: R[]; total: number; pageSize: number }>): Promise<R[]> {
  const first = await read(1);
  const rows = [...first.rows];
  for (let page = 2; (page - 1) * first.pageSize < first.total; page++) {
    const next = await read(page);
    expect(next.rows.length).toBeLessThanOrEqual(first.pageSize);
    rows.push(...next.rows);
  }
  expect(rows.length).toBe(first.total);
  expect((await read(Math.ceil(first.total / first.pageSize) + 1)).rows).toEqual([]);
  return rows;
}

const sql = <T extends object>(query: string, replacements: Record<string, unknown> = {}) =>
  sequelize.query<T>(query, { replacements: { s: s.school.id, ...replacements }, type: QueryTypes.SELECT });

/** `n` more cohorts and `n` more sponsor accounts, so the cohorts and the accounts pass a page too. */
async function addCohortsAndSponsors(n: number, tag: string) {
  await sql(
    `INSERT INTO cohorts (school_id, course_id, name, lead_instructor_id, starts_on)
       SELECT :s, :course, 'Extra cohort ' || :tag || ' ' || lpad(i::text, 3, '0'), :lead, DATE '2026-10-01' + i FROM generate_series(1, :n) i`,
    { course: s.course.id, lead: s.people.instructor2.id, tag, n },
  );
  await sql(
    `INSERT INTO people (school_id, name, email, roles)
       SELECT :s, 'Extra sponsor ' || :tag || ' ' || lpad(i::text, 3, '0'), 'extra.sponsor.' || :tag || '.' || i || '.' || :s || '@chalkwing.test',
              ARRAY['sponsor'] FROM generate_series(1, :n) i`,
    { tag, n },
  );
}

const LISTS = {
  "Roster, chief": () => rosterPage(s.as.chief),
  "Roster, instructor": () => rosterPage(s.as.instructor),
  "Cohorts page": () => cohortsOverview(s.as.chief),
  "Accounts and roles": () => accountsPage(s.school.id),
};

async function measure() {
  const out: Record<string, { queries: number; shown: number; total: number; pageSize: number }> = {};
  for (const [name, read] of Object.entries(LISTS)) {
    await read();
    const queries = await countQueries(read);
    const r = await read();
    const rows = "rows" in r ? r.rows : r.cohorts;
    out[name] = { queries, shown: rows.length, total: r.total, pageSize: r.pageSize };
  }
  return out;
}

it("shows one page of each list with the same number of queries at 20 and at 60 students", async () => {
  await generateScale(20, { schoolId: s.school.id });
  await addCohortsAndSponsors(5, "a");
  const small = await measure();
  await generateScale(40, { schoolId: s.school.id });
  await addCohortsAndSponsors(60, "b");
  const large = await measure();
  expect(large["Roster, chief"]!.pageSize).toBe(STUDENTS_PAGE_SIZE);
  expect(large["Cohorts page"]!.pageSize).toBe(COHORTS_PAGE_SIZE);
  expect(large["Accounts and roles"]!.pageSize).toBe(ACCOUNTS_PAGE_SIZE);
  for (const name of Object.keys(large)) {
    expect(large[name]!.queries).toBe(small[name]!.queries);
    expect(large[name]!.queries).toBeGreaterThan(0);
    for (const at of [small, large]) expect(at[name]!.shown).toBe(Math.min(at[name]!.total, at[name]!.pageSize));
  }
  // the chief's lists grew past a page and show one page of them
  expect(large["Roster, chief"]!.total).toBeGreaterThanOrEqual(small["Roster, chief"]!.total + 40);
  expect(large["Cohorts page"]!.total).toBeGreaterThanOrEqual(small["Cohorts page"]!.total + 60);
  expect(large["Accounts and roles"]!.total).toBe(small["Accounts and roles"]!.total + 60);
  for (const name of ["Roster, chief", "Cohorts page", "Accounts and roles"]) expect(large[name]!.shown).toBe(large[name]!.pageSize);
});

it("pages the Roster: every student in the caller's cohorts today once, the filters apply before paging", async () => {
  const today = (await sql<{ d: string }>(`SELECT (now() AT TIME ZONE :tz)::date::text AS d`, { tz: s.school.timeZone }))[0]!.d;
  const current = (lead: string | null) =>
    sql<{ id: string }>(
      `SELECT m.student_id AS id FROM cohort_memberships m JOIN cohorts c ON c.id = m.cohort_id
        WHERE c.school_id = :s AND m.from_date <= CAST(:today AS date) AND (m.to_date IS NULL OR m.to_date > CAST(:today AS date))
          AND (CAST(:lead AS uuid) IS NULL OR c.lead_instructor_id = CAST(:lead AS uuid))`,
      { today, lead },
    );
  const seen: Record<string, number> = {};
  for (const [who, lead] of [
    ["chief", null],
    ["instructor", s.people.instructor.id],
  ] as const) {
    const rows = await allPages((page) => rosterPage(s.as[who], {}, { page }));
    const ids = rows.map((r) => r.studentId);
    expect(new Set(ids).size).toBe(ids.length);
    expect([...ids].sort()).toEqual((await current(lead)).map((r) => r.id).sort());
    seen[who] = ids.length;
  }
  // the chief's roster spans pages; the instructor's holds only the cohorts they lead
  expect(seen.chief).toBeGreaterThan(STUDENTS_PAGE_SIZE);
  expect(seen.instructor).toBeGreaterThan(0);
  expect(seen.instructor).toBeLessThan(seen.chief!);
  // each row carries its own history and sponsors, read for the page only
  const first = await rosterPage(s.as.chief, { name: s.people.students[0]!.name });
  const own = first.rows.find((r) => r.studentId === s.people.students[0]!.id)!;
  expect(own.sponsors).toEqual([s.people.sponsor.name]);
  expect(own.history).toEqual([{ cohortName: s.cohorts.a.name, fromDate: "2026-09-01", toDate: null }]);
  expect(own.cohortSize).toBe(3);
  // a part of the name, any case, over every page; LIKE's wildcards are literal
  const part = "student 1";
  const named = await allPages((page) => rosterPage(s.as.chief, { name: part.toUpperCase() }, { page }));
  expect(named.length).toBeGreaterThan(0);
  for (const r of named) expect(r.name.toLowerCase()).toContain(part);
  expect((await rosterPage(s.as.chief, { name: "%" })).total).toBe(0);
  // the cohort, by id or by a part of its name
  const byCohort = await rosterPage(s.as.chief, { cohortId: s.cohorts.b.id });
  expect(byCohort.rows.map((r) => r.studentId).sort()).toEqual(
    s.people.students
      .slice(3)
      .map((p) => p.id)
      .sort(),
  );
  expect((await rosterPage(s.as.chief, { cohortName: s.cohorts.b.name.toUpperCase() })).rows.map((r) => r.studentId).sort()).toEqual(
    byCohort.rows.map((r) => r.studentId).sort(),
  );
});

it("the Roster's forms search the open cohorts once there are more than a list holds", async () => {
  const open = await sql<{ id: string }>(`SELECT id FROM cohorts WHERE school_id = :s AND closed_on IS NULL`);
  expect(open.length).toBeGreaterThan(PICKER_LIST_MAX);
  expect(await cohortChoices(s.as.chief, "roster")).toEqual({ kind: "search" });
  // a lead instructor searches them too (the server still checks what they may add to or move)
  const found = await searchCohorts(s.as.instructor, "roster", "extra cohort b 04");
  expect(found.rows.map((r) => r.name)).toEqual(Array.from({ length: 10 }, (_, i) => `Extra cohort b ${String(40 + i).padStart(3, "0")}`));
  expect(found.more).toBe(false);
  await expect(searchCohorts(s.as.sponsor, "roster", "")).rejects.toMatchObject({ status: 403 });
});

it("pages the Cohorts page: every cohort of the school once, a part of the name filters before paging, members counted in full", async () => {
  const rows = await allPages((page) => cohortsOverview(s.as.chief, {}, { page }).then((r) => ({ ...r, rows: r.cohorts })));
  const every = await sql<{ id: string }>(`SELECT id FROM cohorts WHERE school_id = :s`);
  expect(rows.length).toBeGreaterThan(COHORTS_PAGE_SIZE);
  expect(rows.map((c) => c.id).sort()).toEqual(every.map((c) => c.id).sort());
  const named = await allPages((page) =>
    cohortsOverview(s.as.chief, { name: "EXTRA COHORT B" }, { page }).then((r) => ({ ...r, rows: r.cohorts })),
  );
  expect(named).toHaveLength(60);
  for (const c of named) expect(c.name).toContain("Extra cohort b");
  expect((await cohortsOverview(s.as.chief, { name: "_" })).total).toBe(0);
  // today's students: every one counted, at most MEMBERS_SHOWN named, by name
  const counts = await sql<{ id: string; n: number }>(
    `SELECT c.id, count(m.student_id)::int AS n FROM cohorts c
       LEFT JOIN cohort_memberships m ON m.cohort_id = c.id AND m.from_date <= current_date AND (m.to_date IS NULL OR m.to_date > current_date)
      WHERE c.school_id = :s GROUP BY c.id`,
  );
  const count = new Map(counts.map((c) => [c.id, c.n]));
  expect(rows.some((c) => c.memberCount > MEMBERS_SHOWN)).toBe(true);
  for (const c of rows) {
    expect(c.memberCount).toBe(count.get(c.id));
    expect(c.members.length).toBe(Math.min(c.memberCount, MEMBERS_SHOWN));
    expect(c.members.map((m) => m.name)).toEqual([...c.members.map((m) => m.name)].sort((a, b) => (a < b ? -1 : a > b ? 1 : 0)));
  }
  // the Add or move form offers every open cohort, not only this page's: here more than a plain
  // list holds, so it searches them (GET /api/directory/cohorts, tests/integration/directory/pickers.test.ts)
  const { openCohorts } = await cohortsOverview(s.as.chief);
  const open = await sql<{ id: string }>(`SELECT id FROM cohorts WHERE school_id = :s AND closed_on IS NULL`);
  expect(open.length).toBeGreaterThan(PICKER_LIST_MAX);
  expect(openCohorts).toEqual({ kind: "search" });
});

it("pages Accounts and roles: every account but students' once, a part of the name filters before paging", async () => {
  const rows = await allPages((page) => accountsPage(s.school.id, {}, { page }));
  const every = await sql<{ id: string }>(`SELECT id FROM people WHERE school_id = :s AND NOT ('student' = ANY(roles))`);
  expect(rows.length).toBeGreaterThan(ACCOUNTS_PAGE_SIZE);
  expect(rows.map((p) => p.id).sort()).toEqual(every.map((p) => p.id).sort());
  expect(rows.map((p) => p.id)).toEqual(expect.arrayContaining([s.people.chief.id, s.people.instructor.id, s.people.sponsor.id]));
  expect(rows.some((p) => s.people.students.some((st) => st.id === p.id))).toBe(false);
  const named = await allPages((page) => accountsPage(s.school.id, { name: "extra SPONSOR a" }, { page }));
  expect(named.map((p) => p.name)).toEqual(["001", "002", "003", "004", "005"].map((n) => `Extra sponsor a ${n}`));
  expect((await accountsPage(s.school.id, { name: "%" })).total).toBe(0);
});
