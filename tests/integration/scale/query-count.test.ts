import { sequelize } from "@/db/index";
import { generateScale } from "@/db/seed/scale";
import { chiefRecordsSummary } from "@/db/access/records/chief-summary";
import { signOffRegister, REGISTER_PAGE_SIZE } from "@/db/access/records/sign-off-register";
import { progressFor } from "@/db/access/records/progress-map";
import { progressStudentsFor, recordStudentsFor } from "@/db/access/records/student-list";
import { schoolOverview } from "@/db/access/today/school-overview";
import { todayFocusList } from "@/db/access/today/focus-list";
import { listSessions } from "@/db/access/timetable/list-sessions";
import { schedulingChoices } from "@/db/access/timetable/scheduling-choices";
import { makeSchool, closeDb } from "@/tests/helpers/factories";

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

async function countQueries(work: () => Promise<unknown>): Promise<number> {
  const spy = jest.spyOn(sequelize, "query");
  try {
    await work();
    return spy.mock.calls.length;
  } finally {
    spy.mockRestore();
  }
}

const PAGES: Record<string, () => Promise<unknown>> = {
  "chief's Today": () => Promise.all([chiefRecordsSummary(s.as.chief), schoolOverview(s.as.chief), todayFocusList(s.as.chief)]),
  "instructor's Today list": () => todayFocusList(s.as.instructor),
  "Sign-off register (first page)": () => signOffRegister(s.as.chief),
  "Progress map index": () => progressStudentsFor(s.as.chief),
  "one Progress map": () => progressFor(s.as.chief, s.people.students[0]!.id),
  "chief's Records list": () => recordStudentsFor(s.as.chief),
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

it("reads every listing and summary page with the same number of queries at 20 and at 60 students", async () => {
  await generateScale(20, { schoolId: s.school.id });
  const small = await countAll();
  const smallRegister = await registerFirstPage();
  await generateScale(40, { schoolId: s.school.id });
  const large = await countAll();
  const largeRegister = await registerFirstPage();
  for (const name of Object.keys(PAGES)) expect(small[name]).toBeGreaterThan(0);
  expect(large).toEqual(small);
  // 5 sign-offs per generated student: 100 rows match at 20 students, 300 at 60; one page shows 50
  expect(smallRegister.total).toBeGreaterThanOrEqual(100);
  expect(largeRegister.total).toBeGreaterThanOrEqual(smallRegister.total + 200);
  expect(smallRegister.rows).toBe(REGISTER_PAGE_SIZE);
  expect(largeRegister.rows).toBe(REGISTER_PAGE_SIZE);
  expect(largeRegister.size).toBeLessThan(smallRegister.size * 1.2);
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
