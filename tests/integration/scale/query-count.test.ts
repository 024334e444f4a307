import { generateScale } from "@/db/seed/scale";
import { chiefRecordsSummary, TODAY_WAITING_SHOWN } from "@/db/access/records/chief-summary";
import { stagesWaiting } from "@/db/access/records/stages-waiting";
import { signOffRegister, REGISTER_PAGE_SIZE } from "@/db/access/records/sign-off-register";
import { progressFor } from "@/db/access/records/progress-map";
import { progressStudentsPage } from "@/db/access/records/student-list";
import { groundLogStudentsPage } from "@/db/access/ground-log/visible-students";
import { cohortsTop } from "@/db/access/cohorts/list-cohorts";
import { FOCUS_SHOWN } from "@/db/access/today/focus-list";
import { recordStudentsPage, RECORDS_PAGE_SIZE } from "@/db/access/records/record-students-page";
import { schoolOverview } from "@/db/access/today/school-overview";
import { todayFocusList } from "@/db/access/today/focus-list";
import { teachingWeek, CHECKS_DUE_SHOWN } from "@/db/access/today/teaching-week";
import { listSessions } from "@/db/access/timetable/list-sessions";
import { schedulingChoices } from "@/db/access/timetable/scheduling-choices";
import { makeSchool, closeDb, actAs } from "@/tests/helpers/factories";
import { NextRequest } from "next/server";
import { GET as sessionsGET } from "@/app/api/sessions/route";
import { studentWeekFor } from "@/db/access/today/student-week";
import { sequelize } from "@/db/index";
import { countQueries } from "@/tests/helpers/query-count";

// A constant number of SQL queries per request, whatever the size of the school: each page's
// reads are counted at 20 generated students and again after 40 more (with their cohorts, oral
// checks, sign-offs and audit events), and the counts must be the same.

type School = Awaited<ReturnType<typeof makeSchool>>;
let s: School;

beforeAll(async () => {
  s = await makeSchool("scale");
});
afterAll(async () => {
  jest.restoreAllMocks();
  await closeDb();
});

const PAGES: Record<string, () => Promise<unknown>> = {
  "chief's Today": () => Promise.all([chiefRecordsSummary(s.as.chief), schoolOverview(s.as.chief), todayFocusList(s.as.chief)]),
  "instructor's Today list": () => Promise.all([todayFocusList(s.as.instructor), todayFocusList(s.as.instructor2)]),
  "instructor's Today, cohorts led": () => cohortsTop(s.school.id, { leadInstructorId: s.people.instructor.id }, FOCUS_SHOWN),
  "instructor's Today, week and checks due": () => teachingWeek(s.as.instructor),
  "Sign-off register (first page)": () => signOffRegister(s.as.chief),
  "Progress map list (first page)": () => Promise.all([progressStudentsPage(s.as.chief), progressStudentsPage(s.as.instructor)]),
  "Ground log student list (first page)": () => Promise.all([groundLogStudentsPage(s.as.chief), groundLogStudentsPage(s.as.instructor)]),
  "one Progress map": () => progressFor(s.as.chief, s.people.students[0]!.id),
  "chief's Records list (first page)": () => recordStudentsPage(s.as.chief),
  "Timetable list": () => Promise.all([listSessions(s.as.instructor, {}), listSessions(s.as.chief, {}), schedulingChoices(s.as.chief)]),
};

async function countAll(): Promise<Record<string, number>> {
  const out: Record<string, number> = {};
  for (const [name, work] of Object.entries(PAGES)) {
    await work(); // warm: first-time work (a chain checkpoint, caches) is not what is measured
    out[name] = await countQueries(work);
  }
  return out;
}

// The register's first page: its rows (and so its HTML) are bounded by the page size, whatever
// the number of matching rows, which the page reports from one count.
async function registerFirstPage() {
  const r = await signOffRegister(s.as.chief);
  return { rows: r.rows.length, total: r.total, size: JSON.stringify(r.rows).length, notes: r.notes.length };
}

// The chief's Today and the Records list name a bounded number of students, whatever the size of
// the school, and count the rest.
async function boundedLists() {
  const today = await chiefRecordsSummary(s.as.chief);
  const records = await recordStudentsPage(s.as.chief);
  const week = await teachingWeek(s.as.instructor);
  expect(week.checksDue.length).toBe(Math.min(week.checksDueTotal, CHECKS_DUE_SHOWN));
  return {
    waitingShown: today.waiting.length,
    waitingTotal: today.waitingTotal,
    recordsShown: records.rows.length,
    recordsTotal: records.total,
  };
}

it("reads every listing and summary page with the same number of queries at 20 and at 60 students", async () => {
  await generateScale(20, { schoolId: s.school.id });
  const small = await countAll();
  const smallRegister = await registerFirstPage();
  const smallLists = await boundedLists();
  await generateScale(40, { schoolId: s.school.id });
  const large = await countAll();
  const largeRegister = await registerFirstPage();
  const largeLists = await boundedLists();
  for (const name of Object.keys(PAGES)) expect(small[name]).toBeGreaterThan(0);
  expect(large).toEqual(small);
  // 5 sign-offs per generated student: 100 rows match at 20 students, 300 at 60; one page shows 50
  expect(smallRegister.total).toBeGreaterThanOrEqual(100);
  expect(largeRegister.total).toBeGreaterThanOrEqual(smallRegister.total + 200);
  expect(smallRegister.rows).toBe(REGISTER_PAGE_SIZE);
  expect(largeRegister.rows).toBe(REGISTER_PAGE_SIZE);
  expect(largeRegister.size).toBeLessThan(smallRegister.size * 1.2);
  // the Records list: every generated student counted, one page of RECORDS_PAGE_SIZE shown
  expect(largeLists.recordsTotal).toBeGreaterThanOrEqual(smallLists.recordsTotal + 40);
  expect(largeLists.recordsShown).toBe(RECORDS_PAGE_SIZE);
  // Today: every stage waiting counted, at most TODAY_WAITING_SHOWN named, the longest waiting first
  expect(largeLists.waitingTotal).toBeGreaterThanOrEqual(smallLists.waitingTotal);
  expect(largeLists.waitingShown).toBe(Math.min(largeLists.waitingTotal, TODAY_WAITING_SHOWN));
});

it("pages the register in SQL: the pages together hold every matching row once, in order, and a filter is applied before paging", async () => {
  const first = await signOffRegister(s.as.chief);
  const all = [];
  for (let page = 1; (page - 1) * REGISTER_PAGE_SIZE < first.total; page++)
    all.push(...(await signOffRegister(s.as.chief, {}, { page })).rows);
  expect(all.length).toBe(first.total);
  expect(new Set(all.map((r) => r.id)).size).toBe(first.total);
  for (let i = 1; i < all.length; i++) expect(all[i - 1]!.date >= all[i]!.date).toBe(true);
  const signer = all[all.length - 1]!.signerId;
  const bySigner = await signOffRegister(s.as.chief, { instructorId: signer }, { pageSize: null });
  expect(bySigner.rows.length).toBe(all.filter((r) => r.signerId === signer).length);
  expect(bySigner.rows.every((r) => r.signerId === signer)).toBe(true);
});

it("the chain status on Today verifies from the checkpoint and catches up with new events", async () => {
  const first = await chiefRecordsSummary(s.as.chief);
  expect(first.chain.ok).toBe(true);
  const before = first.chain.checked;
  const added = await generateScale(4, { schoolId: s.school.id });
  const next = await chiefRecordsSummary(s.as.chief);
  expect(next.chain).toMatchObject({ ok: true, since: before, checked: before + added.auditEvents });
});

it("the chief's Today counts every stage waiting and names those waiting longest, as the full list would", async () => {
  const all = await stagesWaiting(s.as.chief);
  const today = await chiefRecordsSummary(s.as.chief);
  expect(all.length).toBeGreaterThan(TODAY_WAITING_SHOWN); // generated students each have a stage ready
  expect(today.waitingTotal).toBe(all.length);
  const oldest = [...all].sort((a, b) => (a.since?.getTime() ?? Infinity) - (b.since?.getTime() ?? Infinity));
  const cutoff = oldest[TODAY_WAITING_SHOWN - 1]!.since!.getTime();
  expect(today.waiting).toHaveLength(TODAY_WAITING_SHOWN);
  for (const w of today.waiting) expect(w.since!.getTime()).toBeLessThanOrEqual(cutoff);
  for (let i = 1; i < today.waiting.length; i++)
    expect(today.waiting[i - 1]!.since!.getTime()).toBeLessThanOrEqual(today.waiting[i]!.since!.getTime());
});

it("pages the Records list in SQL: the pages hold every student once, and the filters apply before paging", async () => {
  const first = await recordStudentsPage(s.as.chief);
  const seen: string[] = [];
  for (let page = 1; (page - 1) * RECORDS_PAGE_SIZE < first.total; page++)
    seen.push(...(await recordStudentsPage(s.as.chief, {}, { page })).rows.map((r) => r.id));
  expect(seen.length).toBe(first.total);
  expect(new Set(seen).size).toBe(first.total);
  const cohort = first.cohorts[first.cohorts.length - 1]!;
  const inCohort = await recordStudentsPage(s.as.chief, { cohortId: cohort.id }, { pageSize: 1000 });
  expect(inCohort.total).toBeGreaterThan(0);
  expect(inCohort.rows.every((r) => r.cohortName === cohort.name)).toBe(true);
  const one = inCohort.rows[0]!;
  const byName = await recordStudentsPage(s.as.chief, { name: one.name.slice(1).toUpperCase() });
  expect(byName.rows.map((r) => r.id)).toContain(one.id);
  expect(byName.rows.every((r) => r.name.toLowerCase().includes(one.name.slice(1).toLowerCase()))).toBe(true);
  expect((await recordStudentsPage(s.as.chief, { name: "%" })).total).toBe(0); // LIKE's wildcards are taken literally
});

// One render reads each thing once: the Progress map read the student's items and sign-offs twice
// (once itself, once for the stages), and the student's Today summed the ground minutes twice.
// Here no statement goes out twice with the same values. (The school row is read once per render by
// React `cache`, which keeps nothing outside a render, so it is left out of this count.)
async function repeatedStatements(work: () => Promise<unknown>): Promise<string[]> {
  const spy = jest.spyOn(sequelize, "query");
  try {
    await work();
    const seen = new Map<string, number>();
    for (const [sql, options] of spy.mock.calls) {
      const text = typeof sql === "string" ? sql : JSON.stringify(sql);
      if (/FROM "schools"/.test(text)) continue;
      const key = `${text}\n${JSON.stringify((options as { replacements?: unknown } | undefined)?.replacements ?? null)}`;
      seen.set(key, (seen.get(key) ?? 0) + 1);
    }
    return [...seen].filter(([, n]) => n > 1).map(([k, n]) => `${n}x ${k.slice(0, 120)}`);
  } finally {
    spy.mockRestore();
  }
}

it("reads nothing twice for one Progress map (staff, student, sponsor) or one student's week", async () => {
  const student = s.people.students[0]!.id;
  for (const who of [s.as.chief, s.as.instructor, s.as.student, s.as.sponsor])
    expect(await repeatedStatements(() => progressFor(who, student))).toEqual([]);
  expect(await repeatedStatements(() => studentWeekFor(s.as.student))).toEqual([]);
});

it("GET /api/sessions reads the school once (React `cache` keeps nothing in a route handler, so the route hands it down)", async () => {
  actAs(s.as.instructor);
  const spy = jest.spyOn(sequelize, "query");
  try {
    const res = await sessionsGET(new NextRequest("http://127.0.0.1/api/sessions?from=2026-09-01&to=2026-09-30"), {
      params: Promise.resolve({}),
    });
    expect(res.status).toBe(200);
    const schoolReads = spy.mock.calls.filter(([sql]) => typeof sql === "string" && /FROM "schools"/.test(sql));
    expect(schoolReads).toHaveLength(1);
  } finally {
    spy.mockRestore();
    actAs(null);
  }
});
