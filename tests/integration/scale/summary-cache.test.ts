jest.setTimeout(120_000);
// The chief's and the instructors' Today summaries (stages waiting for their check, watch notes) are
// kept per school and key in summary_cache (migration 0650) and read again only while no table of
// the school's records has been written since and for at most SUMMARY_FRESH_MS. These checks make
// a kept summary observable (a planted value is served) and show each way it is dropped: a write
// to a record table, and age; and that every table of the records carries the trigger that moves
// the version, so a table added later cannot be forgotten.
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { makeSchool, closeDb, TEST_PASSWORD } from "@/tests/helpers/factories";
import { stagesWaitingTop } from "@/db/access/records/stages-waiting";
import { recentWatchNotes } from "@/db/access/records/sign-off-register";
import { withdrawSignOff } from "@/db/access/records/sign-offs";
import { SUMMARY_FRESH_MS } from "@/db/access/shared/summary-cache";
import { NOT_RECORDS } from "@/db/migrations/0650-summary-cache";
import { fixedClock, resetClock } from "@/lib/clock";
import { check, sign, type School } from "../records/helpers";
import { countQueries } from "@/tests/helpers/query-count";

afterAll(async () => {
  resetClock();
  await closeDb();
});

async function stageItems(s: School, code: string): Promise<string[]> {
  const rows = await sequelize.query<{ id: string }>(
    `SELECT i.id FROM syllabus_stages g JOIN syllabus_items i ON i.stage_id = g.id WHERE g.revision_id = :r AND g.code = :c ORDER BY i.position`,
    { replacements: { r: s.revision.id, c: code }, type: QueryTypes.SELECT },
  );
  return rows.map((r) => r.id);
}

async function signStage(s: School, studentId: string, items: string[]) {
  await check(s.as.instructor, studentId, items);
  const out = [];
  for (const itemId of items) out.push(await sign(s.as.instructor, { studentId, itemId }));
  return out;
}

/** Plants a total in the kept stages-waiting summaries of the school, as a summary that missed a write would hold. */
async function plantTotal(schoolId: string, total: number) {
  await sequelize.query(
    `UPDATE summary_cache SET payload = jsonb_set(payload, '{total}', to_jsonb(CAST(:total AS int))) WHERE school_id = :schoolId AND key LIKE 'stages-waiting:%'`,
    { replacements: { schoolId, total } },
  );
}

it("every table of the records moves the summaries' version when written; only the mechanical tables do not", async () => {
  const rows = await sequelize.query<{ tablename: string; has: boolean }>(
    `SELECT t.tablename, EXISTS (SELECT 1 FROM pg_trigger g JOIN pg_class c ON c.oid = g.tgrelid
                                   WHERE c.relname = t.tablename AND g.tgname = 'records_version_bump') AS has
       FROM pg_tables t WHERE t.schemaname = 'public' ORDER BY t.tablename`,
    { type: QueryTypes.SELECT },
  );
  const without = rows.filter((r) => !r.has).map((r) => r.tablename);
  // a new table must either get the trigger (a migration of its own) or be named as mechanical
  expect(without.filter((t) => !NOT_RECORDS.includes(t))).toEqual([]);
  expect(rows.filter((r) => r.has).map((r) => r.tablename)).toEqual(expect.arrayContaining(["sign_offs", "stage_checks", "people"]));
  expect(rows.length).toBeGreaterThan(40);
});

it("a kept summary is served while nothing is written, and a write to the records drops it", async () => {
  const clock = fixedClock(new Date());
  try {
    const s = await makeSchool("summary-cache");
    const aer = await stageItems(s, "AER");
    const [a, b] = [s.people.students[0]!.id, s.people.students[1]!.id];
    await signStage(s, a, aer);

    const first = await stagesWaitingTop(s.as.chief, 10);
    expect(first.total).toBe(1);
    expect(first.top.map((w) => w.studentId)).toEqual([a]);
    expect(first.top[0]!.since).toBeInstanceOf(Date);

    // read again: one query (the version and the kept row together), the same answer, dates revived
    expect(await countQueries(() => stagesWaitingTop(s.as.chief, 10))).toBe(1);
    expect(await stagesWaitingTop(s.as.chief, 10)).toEqual(first);

    // the kept row is what is served: a planted total shows (as a summary that missed a write would)
    await plantTotal(s.school.id, 99);
    expect((await stagesWaitingTop(s.as.chief, 10)).total).toBe(99);

    // a sign-off moves the version: the next read recomputes, and counts the second student
    await signStage(s, b, aer);
    const second = await stagesWaitingTop(s.as.chief, 10);
    expect(second.total).toBe(2);
    expect(second.top.map((w) => w.studentId).sort()).toEqual([a, b].sort());

    // and age alone drops it: planted again, served until SUMMARY_FRESH_MS has passed
    await plantTotal(s.school.id, 99);
    clock.advanceMs(SUMMARY_FRESH_MS - 1_000);
    expect((await stagesWaitingTop(s.as.chief, 10)).total).toBe(99);
    clock.advanceMs(2_000);
    expect((await stagesWaitingTop(s.as.chief, 10)).total).toBe(2);

    // each caller has a summary of their own: the instructor's scope is read for the instructor
    const led = await stagesWaitingTop(s.as.instructor2, 10);
    expect(led.top.every((w) => w.studentId !== a && w.studentId !== b)).toBe(true);
  } finally {
    resetClock();
  }
});

it("the school's watch notes come back from the kept summary with their dates, and a withdrawal shows at once", async () => {
  const s = await makeSchool("summary-notes");
  const aer = await stageItems(s, "AER");
  const a = s.people.students[0]!.id;
  const [so] = await signStage(s, a, aer.slice(0, 1));
  const before = await recentWatchNotes(s.as.chief);
  expect(before.some((n) => n.recordId === so!.id && n.kind === "withdrawn")).toBe(false);

  await sequelize.transaction((t) =>
    withdrawSignOff(t, s.as.instructor, { signOffId: so!.id, reason: "Signed against another student's check.", password: TEST_PASSWORD }),
  );
  const computed = await recentWatchNotes(s.as.chief);
  const withdrawn = computed.find((n) => n.recordId === so!.id && n.kind === "withdrawn");
  expect(withdrawn).toBeDefined();

  const kept = await recentWatchNotes(s.as.chief);
  expect(kept).toEqual(computed);
  expect(kept.every((n) => n.at instanceof Date && (n.reviews ?? []).every((r) => r.reviewedAt instanceof Date))).toBe(true);
  const [row] = await sequelize.query<{ n: number }>(
    `SELECT jsonb_array_length(payload)::int AS n FROM summary_cache WHERE school_id = :id AND key = 'watch-notes'`,
    { replacements: { id: s.school.id }, type: QueryTypes.SELECT },
  );
  expect(row?.n).toBe(computed.length);
});
