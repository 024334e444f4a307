import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import { studentScopeSql, type Caller } from "../shared/student-scope";

// The stages ready for their stage check, for every student the caller keeps records of, in one
// aggregate query (the same rule as `stageReadiness`: every item of the stage has a current
// sign-off, no open make-up item, not passed yet, and the previous stage passed).

export interface StageWaiting {
  studentId: string;
  studentName: string;
  stageCode: string;
  /** the newest current sign-off of the stage's items */
  since: Date | null;
}

/**
 * The query of the stages waiting (one row per student and stage, columns studentId, studentName,
 * stageCode, since, cohortName, position), for callers that order, count or limit it in SQL.
 */
export function stagesWaitingSql(caller: Caller): { sql: string; replacements: Record<string, unknown> } {
  const scope = studentScopeSql(caller, "records", "p.id");
  return {
    sql: `WITH st AS (
       SELECT p.id, p.name, e.id AS enrolment_id, e.revision_id, c.name AS cohort_name
         FROM people p JOIN active_enrolments e ON e.student_id = p.id
         LEFT JOIN cohort_memberships m ON m.student_id = p.id AND m.to_date IS NULL LEFT JOIN cohorts c ON c.id = m.cohort_id
        WHERE p.school_id = :schoolId AND p.active AND ${scope.sql}
     ), cur AS (
       SELECT DISTINCT ON (s.student_id, s.syllabus_item_id) s.id, s.student_id, s.syllabus_item_id, s.signed_at
         FROM sign_offs s WHERE s.school_id = :schoolId
        ORDER BY s.student_id, s.syllabus_item_id, s.generation DESC
     ), per_stage AS (
       SELECT st.id AS student_id, st.name, st.cohort_name, g.id AS stage_id, g.code, g.position,
              count(*) AS items,
              count(cur.id) FILTER (WHERE NOT EXISTS (SELECT 1 FROM sign_off_withdrawals w WHERE w.sign_off_id = cur.id)) AS signed,
              count(*) FILTER (WHERE EXISTS (SELECT 1 FROM makeup_items mi WHERE mi.student_id = st.id AND mi.syllabus_item_id = i.id
                                                                         AND mi.state IN ('open','scheduled'))) AS makeups,
              max(cur.signed_at) FILTER (WHERE NOT EXISTS (SELECT 1 FROM sign_off_withdrawals w WHERE w.sign_off_id = cur.id)) AS since,
              EXISTS (SELECT 1 FROM stage_checks sc WHERE sc.student_id = st.id AND sc.enrolment_id = st.enrolment_id
                                                      AND sc.stage_id = g.id AND sc.result = 'pass') AS passed
         FROM st JOIN syllabus_stages g ON g.revision_id = st.revision_id JOIN syllabus_items i ON i.stage_id = g.id
         LEFT JOIN cur ON cur.student_id = st.id AND cur.syllabus_item_id = i.id
        GROUP BY st.id, st.name, st.cohort_name, st.enrolment_id, g.id, g.code, g.position
     )
     SELECT ps.student_id AS "studentId", ps.name AS "studentName", ps.code AS "stageCode", ps.since,
            ps.cohort_name AS "cohortName", ps.position
       FROM per_stage ps
      WHERE NOT ps.passed AND ps.signed = ps.items AND ps.makeups = 0
        AND NOT EXISTS (SELECT 1 FROM per_stage pv WHERE pv.student_id = ps.student_id AND pv.position = ps.position - 1 AND NOT pv.passed)`,
    replacements: { schoolId: caller.schoolId, ...scope.replacements },
  };
}

export async function stagesWaiting(caller: Caller): Promise<StageWaiting[]> {
  const q = stagesWaitingSql(caller);
  return sequelize.query<StageWaiting>(
    `SELECT w."studentId", w."studentName", w."stageCode", w.since FROM (${q.sql}) w
      ORDER BY w."cohortName" NULLS LAST, w."studentName", w.position`,
    { replacements: q.replacements, type: QueryTypes.SELECT },
  );
}

/**
 * The chief's Today: how many stages are waiting for their check, and the `limit` that have waited
 * longest (every item signed off longest ago first), counted and limited in SQL.
 */
export async function stagesWaitingTop(caller: Caller, limit: number): Promise<{ total: number; top: StageWaiting[] }> {
  const q = stagesWaitingSql(caller);
  const rows = await sequelize.query<StageWaiting & { total: number }>(
    `SELECT w."studentId", w."studentName", w."stageCode", w.since, (count(*) OVER ())::int AS total FROM (${q.sql}) w
      ORDER BY w.since ASC NULLS LAST, w."studentName", w.position
      LIMIT :limit`,
    { replacements: { ...q.replacements, limit }, type: QueryTypes.SELECT },
  );
  const top = rows.map((r) => ({ studentId: r.studentId, studentName: r.studentName, stageCode: r.stageCode, since: r.since }));
  return { total: rows[0]?.total ?? 0, top };
}
