import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { generateScale } from "@/db/seed/scale";
import { endorsementChoices, endorsementLogPage, searchEndorsementChoices, ENDORSEMENT_LOG_PAGE_SIZE } from "@/db/access/endorsements/log";
import { PICKER_LIST_MAX, PICKER_RESULTS } from "@/lib/directory/picker";
import { transferCreditsPage, TRANSFER_CREDITS_PAGE_SIZE } from "@/db/access/transfers/credits";
import { visibleStudentIds } from "@/db/access/shared/student-scope";
import { makeSchool, closeDb } from "@/tests/helpers/factories";
import { countQueries, countQueriesOf } from "@/tests/helpers/query-count";

// The logs a school keeps for years and never prunes (the knowledge-test endorsement log, the
// transfer credits recorded) are shown a page at a time, newest first: the pages read in sequence
// hold exactly the rows of one ORDER BY over the whole log, in that order; a part of the student's
// name narrows before paging; a page costs the same number of queries however long the log.

type School = Awaited<ReturnType<typeof makeSchool>>;
let s: School;

beforeAll(async () => {
  s = await makeSchool("kept-logs");
  await generateScale(60, { schoolId: s.school.id });
}, 120_000);
afterAll(closeDb);

const sql = <T extends object>(query: string, replacements: Record<string, unknown> = {}) =>
  sequelize.query<T>(query, { replacements: { s: s.school.id, ...replacements }, type: QueryTypes.SELECT });

/**
 * Adds an endorsement (attempt `attempt`) for each of the first `n` enrolled students, endorsed on
 * days spread over a year (several on one day, so the tie-breaks count), by the two instructors in
 * turn; every third has a result (passed). Rows written directly: this test is about reading them.
 */
async function addEndorsements(n: number, attempt: number) {
  await sql(
    `WITH e AS (
       SELECT en.id AS enrolment_id, en.student_id, en.course_id, row_number() OVER (ORDER BY p.name, p.id) AS i
         FROM enrolments en JOIN people p ON p.id = en.student_id WHERE p.school_id = :s AND en.status = 'active' LIMIT :n)
     INSERT INTO knowledge_test_endorsements
       (school_id, student_id, course_id, enrolment_id, instructor_id, endorsed_on, authority_name, wording, statement, attempt, audit_hash)
     SELECT :s, e.student_id, e.course_id, e.enrolment_id, CASE WHEN e.i % 2 = 0 THEN CAST(:i1 AS uuid) ELSE CAST(:i2 AS uuid) END,
            DATE '2026-01-05' + ((e.i * 7 + :attempt) % 20)::int, 'Test authority', 'wording', 'A statement long enough for the check.',
            :attempt, md5(e.student_id::text || :attempt)
       FROM e`,
    { n, attempt, i1: s.people.instructor.id, i2: s.people.instructor2.id },
  );
  await sql(
    `INSERT INTO knowledge_test_results
       (school_id, endorsement_id, student_id, course_id, taken_on, score_percent, pass_mark_percent, passed, valid_until, recorded_by, audit_hash)
     SELECT :s, k.id, k.student_id, k.course_id, k.endorsed_on + 3, 90, 70, true, k.endorsed_on + 700, :chief, md5(k.id::text)
       FROM knowledge_test_endorsements k
      WHERE k.school_id = :s AND k.attempt = :attempt AND get_byte(decode(md5(k.id::text), 'hex'), 0) % 3 = 0`,
    { attempt, chief: s.people.chief.id },
  );
}

/** `n` transfer credits on the first enrolled students, recorded at instants one minute apart (two share each instant). */
async function addCredits(n: number) {
  await sql(
    `WITH e AS (
       SELECT en.id AS enrolment_id, en.student_id, en.course_id, row_number() OVER (ORDER BY p.name, p.id) AS i
         FROM enrolments en JOIN people p ON p.id = en.student_id WHERE p.school_id = :s AND en.status = 'active' LIMIT :n)
     INSERT INTO transfer_credits
       (school_id, student_id, course_id, enrolment_id, source_school, source_approved, credited_minutes, cap_minutes, test_kind,
        test_taken_on, test_result, evidence_file_name, evidence_content_type, evidence_byte_size, evidence_sha256, evidence,
        recorded_by, audit_hash, created_at)
     SELECT :s, e.student_id, e.course_id, e.enrolment_id, 'Earlier school ' || e.i, true, 60, 600, 'knowledge', DATE '2026-03-01',
            'passed', 'evidence.pdf', 'application/pdf', 4, md5('x'), '\\x25504446'::bytea, :chief, md5(e.student_id::text),
            TIMESTAMPTZ '2026-04-01 09:00Z' + ((e.i / 2) * interval '1 minute')
       FROM e`,
    { n, chief: s.people.chief.id },
  );
}

/** Every page of a paged log in order, with the pages' sizes and the total checked. */
async function allPages<R>(read: (page: number) => Promise<{ rows: R[]; total: number; pageSize: number }>): Promise<R[]> {
  const first = await read(1);
  const rows = [...first.rows];
  for (let page = 2; (page - 1) * first.pageSize < first.total; page++) {
    const next = await read(page);
    expect(next.rows.length).toBeLessThanOrEqual(first.pageSize);
    expect(next.total).toBe(first.total);
    rows.push(...next.rows);
  }
  expect(rows.length).toBe(first.total);
  expect((await read(Math.ceil(first.total / first.pageSize) + 1)).rows).toEqual([]);
  return rows;
}

describe("the endorsement log, a page at a time", () => {
  let queriesShort: number;

  it("reads a page with the same number of queries for a short log and a long one", async () => {
    await addEndorsements(10, 1);
    await endorsementLogPage(s.as.chief);
    queriesShort = await countQueries(() => endorsementLogPage(s.as.chief));
    await addEndorsements(60, 2);
    await addEndorsements(60, 3);
    const long = await endorsementLogPage(s.as.chief);
    expect(long.total).toBe(130);
    expect(long.rows).toHaveLength(ENDORSEMENT_LOG_PAGE_SIZE);
    expect(await countQueries(() => endorsementLogPage(s.as.chief))).toBe(queriesShort);
    expect(queriesShort).toBeGreaterThan(0);
  });

  it("holds, page after page, the chief's whole log newest first (day, instant, id)", async () => {
    const reference = await sql<{ id: string }>(
      `SELECT id FROM knowledge_test_endorsements WHERE school_id = :s ORDER BY endorsed_on DESC, created_at DESC, id DESC`,
    );
    const paged = await allPages((page) => endorsementLogPage(s.as.chief, {}, { page }));
    expect(paged.map((r) => r.id)).toEqual(reference.map((r) => r.id));
    // several endorsements share a day and an instant (one INSERT), so the id decides between them
    const days = new Set(paged.map((r) => String(r.endorsedOn)));
    expect(days.size).toBeLessThan(paged.length);
  });

  it("gives an instructor only the endorsements they signed of students in their reach", async () => {
    const reach = new Set(await visibleStudentIds(s.as.instructor, "records"));
    const reference = await sql<{ id: string; studentId: string }>(
      `SELECT id, student_id AS "studentId" FROM knowledge_test_endorsements WHERE school_id = :s AND instructor_id = :i
        ORDER BY endorsed_on DESC, created_at DESC, id DESC`,
      { i: s.people.instructor.id },
    );
    const expected = reference.filter((r) => reach.has(r.studentId)).map((r) => r.id);
    const paged = await allPages((page) => endorsementLogPage(s.as.instructor, {}, { page }));
    expect(paged.map((r) => r.id)).toEqual(expected);
    expect(new Set(paged.map((r) => r.instructorName))).toEqual(new Set([s.people.instructor.name]));
  });

  it("narrows by a part of the student's name, any case, before paging; LIKE's wildcards are literal", async () => {
    const someone = (await endorsementLogPage(s.as.chief)).rows[0]!.studentName;
    const part = someone.slice(-6);
    const named = await allPages((page) => endorsementLogPage(s.as.chief, { name: part.toUpperCase() }, { page }));
    expect(named.length).toBeGreaterThan(0);
    for (const r of named) expect(r.studentName.toLowerCase()).toContain(part.toLowerCase());
    const all = await allPages((page) => endorsementLogPage(s.as.chief, {}, { page }));
    expect(named.map((r) => r.id)).toEqual(all.filter((r) => r.studentName.toLowerCase().includes(part.toLowerCase())).map((r) => r.id));
    expect((await endorsementLogPage(s.as.chief, { name: "%" })).total).toBe(0);
  });

  it("offers the result form the endorsements still awaiting a result: a list while few, else a search, in one query", async () => {
    const waiting = await sql<{ id: string; name: string }>(
      `SELECT e.id, p.name FROM knowledge_test_endorsements e JOIN people p ON p.id = e.student_id
         LEFT JOIN knowledge_test_results r ON r.endorsement_id = e.id
        WHERE e.school_id = :s AND r.id IS NULL ORDER BY e.endorsed_on DESC, e.created_at DESC, e.id DESC`,
    );
    // some have results, so the choices are fewer than the log, and more than a list holds
    expect(waiting.length).toBeLessThan(130);
    expect(waiting.length).toBeGreaterThan(PICKER_LIST_MAX);
    const { queries, value } = await countQueriesOf(() => endorsementChoices(s.as.chief, "awaiting"));
    expect(value).toEqual({ kind: "search" });
    expect(queries).toBe(1);
    // a part of a student's name: the first PICKER_RESULTS of theirs, newest first, and whether more match
    const part = waiting[0]!.name.slice(-6);
    const expected = waiting.filter((w) => w.name.toLowerCase().includes(part.toLowerCase()));
    const found = await searchEndorsementChoices(s.as.chief, "awaiting", part.toUpperCase());
    expect(found.rows.map((r) => r.id)).toEqual(expected.slice(0, PICKER_RESULTS).map((w) => w.id));
    expect(found.more).toBe(expected.length > PICKER_RESULTS);
    for (const r of found.rows) expect(r.detail).toMatch(/^[A-Z][a-z]{2} \d{1,2} [A-Z][a-z]{2} \d{4}$/);
    // no text: the newest PICKER_RESULTS, with more to come
    const newest = await searchEndorsementChoices(s.as.chief, "awaiting", "");
    expect(newest.rows.map((r) => r.id)).toEqual(waiting.slice(0, PICKER_RESULTS).map((w) => w.id));
    expect(newest.more).toBe(true);
  });
});

describe("the transfer credits recorded, a page at a time", () => {
  it("reads a page with the same number of queries for few credits and many", async () => {
    await addCredits(4);
    await transferCreditsPage(s.as.chief);
    const few = await countQueries(() => transferCreditsPage(s.as.chief));
    await addCredits(56);
    const many = await transferCreditsPage(s.as.chief);
    expect(many.total).toBe(60);
    expect(many.rows).toHaveLength(TRANSFER_CREDITS_PAGE_SIZE);
    expect(await countQueries(() => transferCreditsPage(s.as.chief))).toBe(few);
  });

  it("holds, page after page, every credit newest first (instant, then id), narrowed by a part of the student's name", async () => {
    const reference = await sql<{ id: string }>(`SELECT id FROM transfer_credits WHERE school_id = :s ORDER BY created_at DESC, id DESC`);
    const paged = await allPages((page) => transferCreditsPage(s.as.chief, {}, { page }));
    expect(paged.map((r) => r.id)).toEqual(reference.map((r) => r.id));
    const part = paged[0]!.studentName.slice(-6).toLowerCase();
    const named = await allPages((page) => transferCreditsPage(s.as.chief, { name: part }, { page }));
    expect(named.map((r) => r.id)).toEqual(paged.filter((r) => r.studentName.toLowerCase().includes(part)).map((r) => r.id));
  });

  it("refuses anyone but the chief", async () => {
    await expect(transferCreditsPage(s.as.instructor)).rejects.toMatchObject({ status: 403 });
  });
});
