import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import type { CheckOutcome, QuestionOutcome } from "@/lib/records/outcome";
import type { OralCheckFacts, SignOffFacts, StageCheckFacts } from "@/lib/records/watch-notes";

// The facts behind the Sign-off register's watch notes: sign-offs, stage checks and oral checks
// (the latest of the school, of one student, or the rows of one page), and the covering sessions
// missed without a completed make-up by their students.

export interface SignOffRow extends SignOffFacts {
  cohort_id: string | null;
  cohort_name: string | null;
  stage_id: string;
  stage_code: string;
  item_title: string;
  check_level: string;
  check_outcome: CheckOutcome;
  /** the signed item's own result in its basis check (the stored per-item outcome), null if not stored */
  item_meets: boolean | null;
  /** the outcomes of the basis check's questions on the signed item, in order */
  item_question_outcomes: QuestionOutcome[] | null;
  amended_by: string | null;
  signature_hash: string;
}

export interface StageCheckRow extends StageCheckFacts {
  cohort_id: string | null;
  cohort_name: string | null;
  stage_id: string;
  stage_code: string;
  stage_title: string;
  result: "pass" | "fail";
  written_score_percent: string | null;
  pass_mark_percent: string;
  attempt: number;
  signature_hash: string;
  oral_outcomes: { code?: string; outcome: QuestionOutcome }[];
}

export interface RegisterFacts {
  signOffs: SignOffRow[];
  stageChecks: StageCheckRow[];
  oralChecks: OralCheckFacts[];
  missedSessions: Set<string>;
}

const SIGN_OFF_SELECT = `SELECT s.id, s.student_id, st.name AS student_name, c.id AS cohort_id, c.name AS cohort_name, g.id AS stage_id, g.code AS stage_code,
            i.id AS item_id, i.code AS item_code, i.title AS item_title, e.course_id, s.signer_id, sp.name AS signer_name, s.signed_on, s.signed_at,
            oc.occurred_at AS check_at, oc.level_shown AS check_level, oc.outcome AS check_outcome,
            (SELECT (e->>'meets')::boolean FROM jsonb_array_elements(oc.item_outcomes) e WHERE e->>'itemId' = s.syllabus_item_id::text LIMIT 1) AS item_meets,
            (SELECT array_agg(q.outcome ORDER BY q.position) FROM oral_check_questions q
              WHERE q.check_id = s.basis_check_id AND q.syllabus_item_id = s.syllabus_item_id) AS item_question_outcomes,
            s.amends_id, s.amend_reason,
            w.reason AS withdraw_reason, (SELECT a.id FROM sign_offs a WHERE a.amends_id = s.id LIMIT 1) AS amended_by, s.signature_hash
       FROM sign_offs s
       JOIN people st ON st.id = s.student_id JOIN people sp ON sp.id = s.signer_id
       JOIN syllabus_items i ON i.id = s.syllabus_item_id JOIN syllabus_stages g ON g.id = i.stage_id
       JOIN enrolments e ON e.id = s.enrolment_id JOIN oral_checks oc ON oc.id = s.basis_check_id
       LEFT JOIN sign_off_withdrawals w ON w.sign_off_id = s.id
       LEFT JOIN cohort_memberships m ON m.student_id = s.student_id AND m.to_date IS NULL LEFT JOIN cohorts c ON c.id = m.cohort_id`;

const STAGE_CHECK_SELECT = `SELECT s.id, s.student_id, st.name AS student_name, c.id AS cohort_id, c.name AS cohort_name, g.id AS stage_id, g.code AS stage_code, g.title AS stage_title,
            s.examiner_id, ep.name AS examiner_name, s.lead_instructor_id, s.override_reason, s.result, s.written_score_percent, s.pass_mark_percent,
            s.occurred_at, s.recorded_at, s.attempt, s.signature_hash, s.oral_outcomes
       FROM stage_checks s JOIN people st ON st.id = s.student_id JOIN people ep ON ep.id = s.examiner_id JOIN syllabus_stages g ON g.id = s.stage_id
       LEFT JOIN cohort_memberships m ON m.student_id = s.student_id AND m.to_date IS NULL LEFT JOIN cohorts c ON c.id = m.cohort_id`;

/** `${studentId}:${itemId}` of covering sessions missed without a completed make-up, for these students. */
async function missedSessionsOf(schoolId: string, studentIds: string[]): Promise<Set<string>> {
  const students = [...new Set(studentIds)];
  if (students.length === 0) return new Set();
  const missed = await sequelize.query<{ student_id: string; item_id: string }>(
    `SELECT DISTINCT g.student_id, x.item_id FROM ground_log_current g CROSS JOIN LATERAL unnest(g.syllabus_item_ids) AS x(item_id)
      WHERE g.school_id = :schoolId AND g.status IN ('absent','absent_excused') AND g.student_id IN (:students)
        AND NOT EXISTS (SELECT 1 FROM makeup_items mi WHERE mi.student_id = g.student_id AND mi.syllabus_item_id = x.item_id AND mi.state = 'done')`,
    { replacements: { schoolId, students }, type: QueryTypes.SELECT },
  );
  return new Set(missed.map((r) => `${r.student_id}:${r.item_id}`));
}

/**
 * Reads the register's facts of a school for its watch notes: the latest `limit` sign-offs, stage
 * checks and oral checks (a bounded read; null reads them all); with `studentId`, only that
 * student's records (the caller's access to that student must have been checked).
 */
export async function registerFacts(
  schoolId: string,
  studentId: string | null = null,
  limit: number | null = null,
): Promise<RegisterFacts> {
  const replacements = { schoolId, studentId, limit };
  const scope = `s.school_id = :schoolId AND (CAST(:studentId AS uuid) IS NULL OR s.student_id = CAST(:studentId AS uuid))`;
  const signOffs = await sequelize.query<SignOffRow>(`${SIGN_OFF_SELECT} WHERE ${scope} ORDER BY s.signed_at DESC LIMIT :limit`, {
    replacements,
    type: QueryTypes.SELECT,
  });
  const stageChecks = await sequelize.query<StageCheckRow>(
    `${STAGE_CHECK_SELECT} WHERE ${scope} ORDER BY s.recorded_at DESC LIMIT :limit`,
    {
      replacements,
      type: QueryTypes.SELECT,
    },
  );
  const oralChecks = await sequelize.query<OralCheckFacts>(
    `SELECT * FROM (
       SELECT c.id, c.student_id, st.name AS student_name, c.occurred_at, c.recorded_at, c.amends_id, c.amend_reason, w.reason AS withdraw_reason, w.withdrawn_at,
              (SELECT array_agg(DISTINCT q.item_code) FROM oral_check_questions q WHERE q.check_id = c.id AND q.outcome = 'not_yet') AS not_yet_items
         FROM oral_checks c JOIN people st ON st.id = c.student_id LEFT JOIN oral_check_withdrawals w ON w.check_id = c.id
        WHERE c.school_id = :schoolId AND (CAST(:studentId AS uuid) IS NULL OR c.student_id = CAST(:studentId AS uuid))
        ORDER BY c.occurred_at DESC LIMIT :limit) x
      ORDER BY x.occurred_at`,
    { replacements, type: QueryTypes.SELECT },
  );
  const missedSessions = await missedSessionsOf(
    schoolId,
    signOffs.map((s) => s.student_id),
  );
  return { signOffs, stageChecks, oralChecks, missedSessions };
}

/** The facts of the given sign-offs and stage checks only (a page of the register, a batch of its CSV). */
export async function registerRowFacts(
  schoolId: string,
  signOffIds: string[],
  stageCheckIds: string[],
): Promise<Omit<RegisterFacts, "oralChecks">> {
  const replacements = {
    schoolId,
    signOffIds: signOffIds.length ? signOffIds : [null],
    stageCheckIds: stageCheckIds.length ? stageCheckIds : [null],
  };
  const signOffs = signOffIds.length
    ? await sequelize.query<SignOffRow>(`${SIGN_OFF_SELECT} WHERE s.school_id = :schoolId AND s.id IN (:signOffIds)`, {
        replacements,
        type: QueryTypes.SELECT,
      })
    : [];
  const stageChecks = stageCheckIds.length
    ? await sequelize.query<StageCheckRow>(`${STAGE_CHECK_SELECT} WHERE s.school_id = :schoolId AND s.id IN (:stageCheckIds)`, {
        replacements,
        type: QueryTypes.SELECT,
      })
    : [];
  const missedSessions = await missedSessionsOf(
    schoolId,
    signOffs.map((s) => s.student_id),
  );
  return { signOffs, stageChecks, missedSessions };
}

/**
 * The register's stage filter choices (a few per course revision). The signer and cohort filters
 * grow with the school: they list while few and search beyond (db/access/directory).
 */
export async function registerFilterOptions(schoolId: string) {
  const stages = await sequelize.query<{ id: string; label: string }>(
    `SELECT g.id, co.code || ' r' || r.number || ' · ' || g.code || ' ' || g.title AS label
       FROM syllabus_stages g JOIN syllabus_revisions r ON r.id = g.revision_id JOIN courses co ON co.id = r.course_id
      WHERE co.school_id = :schoolId ORDER BY co.code, r.number, g.position`,
    { replacements: { schoolId }, type: QueryTypes.SELECT },
  );
  return { stages };
}
