import { randomBytes } from "node:crypto";
import { QueryTypes, Transaction } from "sequelize";
import { sequelize } from "../index";
import { DEFAULT_OUTCOME_RULE } from "@/lib/records/outcome";

// A school of a chosen size, for benchmarks and for the query-count test: N students in N/25
// cohorts of an existing (migrated and seeded) school, each with 20 oral checks (one question
// each), 5 sign-offs and their audit events. Everything is written by set-based SQL
// (INSERT … SELECT generate_series) through the same constraints and triggers the app meets:
// audit rows get their chain position and hash from the chain's own trigger, sign-offs pass the
// generation guard, memberships the one-cohort-at-a-time exclusion. Each run adds a new batch
// tagged with its own short id (names and e-mail addresses carry it), so it can run again.

export const CHECKS_PER_STUDENT = 20;
export const SIGN_OFFS_PER_STUDENT = 5;
export const STUDENTS_PER_COHORT = 25;

export interface ScaleResult {
  tag: string;
  schoolId: string;
  students: number;
  cohorts: number;
  oralChecks: number;
  signOffs: number;
  auditEvents: number;
}

const FIRST = ["Arla", "Bex", "Cormac", "Dalia", "Eero", "Fenna", "Gideon", "Hollis", "Isla", "Joren", "Kestrel", "Linnea"];
const LAST = ["Ashcombe", "Brightwater", "Carrow", "Dunmere", "Elderby", "Fallowfield", "Greyhythe", "Harrowgate", "Ivybridge"];

async function one<T extends object>(sql: string, replacements: Record<string, unknown>, t: Transaction): Promise<T> {
  const [row] = await sequelize.query<T>(sql, { replacements, type: QueryTypes.SELECT, transaction: t });
  if (!row) throw new Error(`scale: nothing found for ${sql.slice(0, 60)}`);
  return row;
}

/** Adds `students` students (and their cohorts, checks, sign-offs, audit events) to a school. */
export async function generateScale(students: number, opts: { schoolId?: string; log?: (m: string) => void } = {}): Promise<ScaleResult> {
  if (!Number.isInteger(students) || students < 1 || students > 100_000) throw new Error("students: a whole number from 1 to 100000");
  const log = opts.log ?? (() => undefined);
  const tag = randomBytes(3).toString("hex");
  const cohorts = Math.ceil(students / STUDENTS_PER_COHORT);
  return sequelize.transaction({ isolationLevel: Transaction.ISOLATION_LEVELS.READ_COMMITTED }, async (t) => {
    const school = await one<{ id: string; time_zone: string }>(
      `SELECT id, time_zone FROM schools WHERE (CAST(:id AS uuid) IS NULL OR id = CAST(:id AS uuid)) ORDER BY created_at LIMIT 1`,
      { id: opts.schoolId ?? null },
      t,
    );
    const course = await one<{ course_id: string; revision_id: string; items: number }>(
      `SELECT c.id AS course_id, r.id AS revision_id, (SELECT count(*)::int FROM syllabus_items i WHERE i.revision_id = r.id) AS items
         FROM courses c JOIN syllabus_revisions r ON r.course_id = c.id
        WHERE c.school_id = :s AND EXISTS (SELECT 1 FROM syllabus_items i WHERE i.revision_id = r.id)
        ORDER BY c.created_at, r.number DESC LIMIT 1`,
      { s: school.id },
      t,
    );
    const { n: instructors } = await one<{ n: number }>(
      `SELECT count(*)::int AS n FROM people WHERE school_id = :s AND active AND 'instructor' = ANY(roles)`,
      { s: school.id },
      t,
    );
    if (instructors < 1) throw new Error("scale: the school has no instructor to lead the cohorts");
    const signOffs = Math.min(SIGN_OFFS_PER_STUDENT, course.items);
    const r = {
      rule: JSON.stringify(DEFAULT_OUTCOME_RULE),
      s: school.id,
      tz: school.time_zone,
      tag,
      n: students,
      k: cohorts,
      course: course.course_id,
      rev: course.revision_id,
    };
    const q = (sql: string) => sequelize.query(sql, { replacements: r, transaction: t });

    // Ids are derived from the run's tag (md5 → uuid), so each statement can find the rows of the
    // statements before it without temporary tables (the app role may not create them). The md5 is
    // given the version (4) and variant (10xx) bits of a random UUID (RFC 9562), as gen_random_uuid
    // makes them: forms and query strings check ids as UUIDs, and a bare md5 is not one.
    const id = (kind: string, ...parts: string[]) =>
      `overlay(overlay(md5(:tag || ':${kind}:' || ${parts.join(" || ':' || ")}) placing '4' from 13) placing '8' from 17)::uuid`;
    const items = `(SELECT row_number() OVER (ORDER BY g.position, i.position) - 1 AS no, i.id, i.code
                      FROM syllabus_items i JOIN syllabus_stages g ON g.id = i.stage_id WHERE i.revision_id = :rev)`;
    const instr = `(SELECT row_number() OVER (ORDER BY name, id) - 1 AS no, id, roles
                      FROM people WHERE school_id = :s AND active AND 'instructor' = ANY(roles))`;
    const studentsOf = `generate_series(1, :n) AS st(no)`;
    const cohortOf = `((st.no - 1) / ${STUDENTS_PER_COHORT})`;

    log(`[scale] ${tag}: ${students} students in ${cohorts} cohorts`);
    await q(`
      INSERT INTO cohorts (id, school_id, course_id, name, lead_instructor_id, starts_on)
        SELECT ${id("c", "c.no::text")}, :s, :course, 'Scale ' || :tag || ' C' || lpad((c.no + 1)::text, 4, '0'), ins.id,
               (now() - interval '200 days')::date
          FROM generate_series(0, :k - 1) AS c(no) JOIN ${instr} ins ON ins.no = c.no % ${instructors};
      INSERT INTO people (id, school_id, name, email, roles)
        SELECT ${id("s", "st.no::text")}, :s,
               (ARRAY['${FIRST.join("','")}'])[1 + st.no % ${FIRST.length}] || ' ' ||
                 (ARRAY['${LAST.join("','")}'])[1 + (st.no / ${FIRST.length}) % ${LAST.length}] || ' ' || :tag || '-' || st.no,
               'scale-' || :tag || '-' || st.no || '@scale.chalkwing.test', ARRAY['student']
          FROM ${studentsOf};
      INSERT INTO enrolments (id, student_id, course_id, revision_id, enrolled_on, status)
        SELECT ${id("e", "st.no::text")}, ${id("s", "st.no::text")}, :course, :rev, (now() - interval '200 days')::date, 'active'
          FROM ${studentsOf};
      INSERT INTO cohort_memberships (cohort_id, student_id, from_date)
        SELECT ${id("c", `${cohortOf}::text`)}, ${id("s", "st.no::text")}, (now() - interval '200 days')::date FROM ${studentsOf};`);

    // Oral checks: check j (1..20) of a student covers item (j - 1) mod items, by the cohort's lead,
    // every third day going back, one Solid question on the item, meeting the standard.
    log(`[scale] ${tag}: ${students * CHECKS_PER_STUDENT} oral checks`);
    const checks = `(SELECT ${id("k", "st.no::text", "j::text")} AS id, ${id("s", "st.no::text")} AS student_id,
                            ${id("e", "st.no::text")} AS enrolment_id, st.no AS student_no, j, co.lead_instructor_id AS instructor_id,
                            it.id AS item_id, it.code AS item_code,
                            date_trunc('minute', now()) - make_interval(days => 3 * (${CHECKS_PER_STUDENT} - j) + 5)
                              + make_interval(mins => st.no % 480) AS occurred_at
                       FROM ${studentsOf} CROSS JOIN generate_series(1, ${CHECKS_PER_STUDENT}) j
                       JOIN cohorts co ON co.id = ${id("c", `${cohortOf}::text`)}
                       JOIN ${items} it ON it.no = (j - 1) % ${course.items})`;
    await q(`
      INSERT INTO oral_checks (id, school_id, student_id, enrolment_id, instructor_id, level_shown, remarks, duration_minutes,
                               occurred_at, recorded_at, outcome, outcome_rule, item_outcomes)
        SELECT id, :s, student_id, enrolment_id, instructor_id, 'correlation', 'Generated for a scale run.', 20,
               occurred_at, occurred_at + interval '30 minutes', 'meets', CAST(:rule AS jsonb),
               jsonb_build_array(jsonb_build_object('itemId', item_id, 'code', item_code, 'meets', true, 'reasons', '[]'::jsonb))
          FROM ${checks} x;
      INSERT INTO oral_check_items (check_id, syllabus_item_id) SELECT id, item_id FROM ${checks} x;
      INSERT INTO oral_check_questions (check_id, position, syllabus_item_id, item_code, question_text, answer_summary, outcome)
        SELECT id, 1, item_id, item_code, 'Explain ' || item_code || ' in your own words.', 'Clear and complete.', 'solid'
          FROM ${checks} x;`);

    // Sign-offs: the first items, each on its own check (check j covers item j), a day later.
    log(`[scale] ${tag}: ${students * signOffs} sign-offs`);
    const signed = `(SELECT ${id("o", "c.student_no::text", "c.j::text")} AS id, c.student_id, c.enrolment_id, c.item_id, c.item_code,
                            c.id AS basis_check_id, c.instructor_id AS signer_id, c.occurred_at + interval '1 day' AS signed_at,
                            ((c.occurred_at + interval '1 day') AT TIME ZONE :tz)::date AS signed_on,
                            'I certify that the student meets the standard of ' || c.item_code || '.' AS statement
                       FROM ${checks} c WHERE c.j <= ${signOffs})`;
    await q(`
      INSERT INTO sign_offs (id, school_id, student_id, syllabus_item_id, enrolment_id, generation, basis_check_id, signer_id,
                             statement, signed_on, signed_at, signature_hash)
        SELECT id, :s, student_id, item_id, enrolment_id, 1, basis_check_id, signer_id, statement, signed_on, signed_at,
               encode(sha256(convert_to(concat_ws('|', statement, student_id, item_id, basis_check_id, signer_id, signed_on, signed_at), 'UTF8')), 'hex')
          FROM ${signed} x;`);

    // Audit events in the order the acts happened, each linked by the chain's own trigger.
    log(`[scale] ${tag}: ${students * (CHECKS_PER_STUDENT + signOffs)} audit events`);
    await q(`
      INSERT INTO audit_events (school_id, actor_id, actor_roles, action, record_type, record_id, after, occurred_at, chain_pos, prev_hash, hash, seq)
        SELECT :s, x.actor_id, p.roles, x.action, x.record_type, x.record_id, x.after, x.at, 0, '', '', 0
          FROM (
            SELECT c.instructor_id AS actor_id, 'check.recorded' AS action, 'oral_check' AS record_type, c.id AS record_id,
                   jsonb_build_object('studentId', c.student_id, 'itemCodes', jsonb_build_array(c.item_code), 'levelShown', 'correlation',
                                      'outcome', 'meets', 'occurredAt', c.occurred_at) AS after,
                   c.occurred_at + interval '30 minutes' AS at
              FROM ${checks} c
            UNION ALL
            SELECT s.signer_id, 'signoff.signed', 'sign_off', s.id,
                   jsonb_build_object('studentId', s.student_id, 'itemId', s.item_id, 'itemCode', s.item_code, 'basisCheckId', s.basis_check_id,
                                      'signedOn', s.signed_on, 'generation', 1),
                   s.signed_at
              FROM ${signed} s
          ) x JOIN people p ON p.id = x.actor_id
         ORDER BY x.at, x.record_id`);
    const result: ScaleResult = {
      tag,
      schoolId: school.id,
      students,
      cohorts,
      oralChecks: students * CHECKS_PER_STUDENT,
      signOffs: students * signOffs,
      auditEvents: students * (CHECKS_PER_STUDENT + signOffs),
    };
    log(`[scale] ${tag}: done ${JSON.stringify(result)}`);
    return result;
  });
}
