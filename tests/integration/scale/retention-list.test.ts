import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { generateScale } from "@/db/seed/scale";
import {
  LISTED_STATES,
  RETENTION_PAGE_SIZE,
  RETENTION_SECTION_FIRST,
  retentionOverview,
  type ListedState,
} from "@/db/access/retention/records";
import { retentionFor, type RetentionRule } from "@/lib/retention/rules";
import { makeSchool, closeDb } from "@/tests/helpers/factories";
import { countQueries } from "@/tests/helpers/query-count";
import { resetClock, setClock } from "@/lib/clock";

// The chief's archive list (Retention) used to read every student of the school with three
// subqueries each and sort out the ended trainings in JavaScript (5 s at 10,000 students). It is
// now counted, sorted and paged in SQL: each record's state there must be exactly the one the
// pure rule `retentionFor` gives (lib/retention/rules.ts, checked against 14 CFR 141.101(d),
// 61.189(c) and EASA ORA.ATO.120 in its unit test), including 29 February, whose anniversary in a
// year without it is 1 March ("at least" the whole years). The sections name their first 20 by
// name; one state alone is paged 50 at a time; two queries however many students have left.

type School = Awaited<ReturnType<typeof makeSchool>>;
let s: School;
const TODAY = "2027-03-01";

const sql = <T extends object>(query: string, replacements: Record<string, unknown> = {}) =>
  sequelize.query<T>(query, { replacements: { s: s.school.id, ...replacements }, type: QueryTypes.SELECT });

beforeAll(async () => {
  s = await makeSchool("retention-list");
  await generateScale(120, { schoolId: s.school.id });
  // noon in London on TODAY, whatever the machine's zone
  setClock(() => new Date(`${TODAY}T12:00:00Z`));
  // end the training of 110 generated students on days spread over six years (to the day of the
  // retention boundaries), 29 February 2024 and 2020 among them; the last 10 stay in training
  const students = await sql<{ id: string }>(
    `SELECT p.id FROM people p WHERE p.school_id = :s AND p.email LIKE 'scale-%' ORDER BY p.name, p.id`,
  );
  const ends = [
    "2024-02-29", // 3 years: 2027-03-01 = TODAY (kept; an anniversary of 28 February would make it due)
    "2024-02-28", // 3 years: 2027-02-28 (due)
    "2024-03-01", // 3 years: 2027-03-01 (kept)
    "2026-02-28", // 1 year: 2027-02-28 (due)
    "2026-03-01", // 1 year: TODAY (kept)
    "2020-02-29",
  ];

  for (const [i, st] of students.slice(0, 110).entries()) {
    const day = ends[i] ?? new Date(Date.parse("2020-06-01T00:00:00Z") + i * 17 * 86_400_000).toISOString().slice(0, 10);
    await sql(
      `UPDATE enrolments SET status = 'completed', ended_on = :d, end_kind = :k, end_reason = 'left' WHERE student_id = :st AND status = 'active'`,
      { d: day, k: i % 3 === 0 ? "terminated" : "graduated", st: st.id },
    );
  }
  // legal holds on four, archived marks on three (rows written directly: this test is about reading)
  await sql(
    `INSERT INTO retention_holds (school_id, student_id, reason, set_by)
     SELECT :s, p.id, 'a pending claim', :chief FROM people p WHERE p.id IN (:ids)`,
    { chief: s.people.chief.id, ids: students.slice(10, 14).map((x) => x.id) },
  );
  await sql(
    `INSERT INTO record_archivals (school_id, student_id, ended_on, keep_until, archived_by, audit_hash)
     SELECT :s, e.student_id, e.ended_on, e.ended_on + 400, :chief, md5(e.student_id::text)
       FROM enrolments e WHERE e.student_id IN (:ids)`,
    { chief: s.people.chief.id, ids: students.slice(20, 23).map((x) => x.id) },
  );
}, 180_000);
afterAll(async () => {
  resetClock();
  await closeDb();
});

/** The reference: every student of the school with an ended training and none active, decided by `retentionFor`. */
async function reference(rules: RetentionRule[]) {
  const rows = await sql<{ id: string; name: string; endedOn: string; held: boolean; archived: boolean }>(
    `SELECT p.id, p.name, to_char(max(e.ended_on), 'YYYY-MM-DD') AS "endedOn",
            EXISTS (SELECT 1 FROM retention_holds h WHERE h.student_id = p.id AND h.lifted_at IS NULL) AS held,
            EXISTS (SELECT 1 FROM record_archivals a WHERE a.student_id = p.id) AS archived
       FROM people p JOIN enrolments e ON e.student_id = p.id
      WHERE p.school_id = :s GROUP BY p.id, p.name HAVING NOT bool_or(e.status = 'active') ORDER BY p.name, p.id`,
  );
  return rows.map((r) => ({
    id: r.id,
    state: retentionFor({ endedOn: r.endedOn, rules, onHold: r.held, archived: r.archived, today: TODAY }).state as ListedState,
  }));
}

async function setRules(v: { school: boolean; instructor: boolean; easa: boolean }) {
  await sql(
    `INSERT INTO retention_settings (school_id, school_records, instructor_records, easa_ato) VALUES (:s, :a, :b, :c)
     ON CONFLICT (school_id) DO UPDATE SET school_records = :a, instructor_records = :b, easa_ato = :c`,
    { a: v.school, b: v.instructor, c: v.easa },
  );
}

describe.each([
  ["1 year (14 CFR 141.101(d) alone)", { school: true, instructor: false, easa: false }, ["school_records"]],
  [
    "3 years (the longest of all three)",
    { school: true, instructor: true, easa: true },
    ["school_records", "instructor_records", "easa_ato"],
  ],
  ["no rule", { school: false, instructor: false, easa: false }, []],
] as const)("with %s", (_, settings, rules) => {
  beforeAll(() => setRules(settings));

  it("counts each state as retentionFor decides it, and names the first 20 of each by name", async () => {
    const ref = await reference([...rules]);
    expect(ref.length).toBe(110);
    const o = await retentionOverview(s.as.chief);
    for (const state of LISTED_STATES) {
      const ids = ref.filter((r) => r.state === state).map((r) => r.id);
      expect(o.counts[state]).toBe(ids.length);
      expect(o.sections[state].map((r) => r.studentId)).toEqual(ids.slice(0, RETENTION_SECTION_FIRST));
      for (const r of o.sections[state]) expect(r.state).toBe(state);
    }
    // the edges fell on both sides: something is due and something is kept once a rule applies
    if (rules.length) {
      expect(o.counts.due).toBeGreaterThan(0);
      expect(o.counts.kept).toBeGreaterThan(0);
    } else expect(o.counts.due).toBe(0);
    expect(o.counts.held).toBe(4);
    expect(o.counts.archived).toBe(3);
  });

  it("pages one state, 50 at a time, holding every record of that state once", async () => {
    const ref = await reference([...rules]);
    for (const state of ["due", "kept"] as const) {
      const ids = ref.filter((r) => r.state === state).map((r) => r.id);
      const seen: string[] = [];
      for (let page = 1; page === 1 || (page - 1) * RETENTION_PAGE_SIZE < ids.length; page++) {
        const o = await retentionOverview(s.as.chief, { state, page });
        expect(o.sections[state].length).toBeLessThanOrEqual(RETENTION_PAGE_SIZE);
        for (const other of LISTED_STATES) if (other !== state) expect(o.sections[other]).toEqual([]);
        seen.push(...o.sections[state].map((r) => r.studentId));
      }
      expect(seen).toEqual(ids);
    }
  });
});

it("reads the list with the same number of queries however many students have left", async () => {
  const read = () => retentionOverview(s.as.chief);
  await read();
  const before = await countQueries(read);
  await generateScale(30, { schoolId: s.school.id });
  await sql(
    `UPDATE enrolments e SET status = 'completed', ended_on = DATE '2022-05-05', end_kind = 'graduated', end_reason = 'left'
      FROM people p WHERE p.id = e.student_id AND p.school_id = :s AND e.status = 'active' AND p.email LIKE 'scale-%'`,
  );
  expect(await countQueries(read)).toBe(before);
  expect(before).toBeGreaterThan(0);
});
