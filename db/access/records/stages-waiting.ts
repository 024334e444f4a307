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

export async function stagesWaiting(caller: Caller): Promise<StageWaiting[]> {
  const scope = studentScopeSql(caller, "records", "p.id");
  return sequelize.query<StageWaiting>(
    `WITH st AS (
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
     SELECT ps.student_id AS "studentId", ps.name AS "studentName", ps.code AS "stageCode", ps.since
       FROM per_stage ps
      WHERE NOT ps.passed AND ps.signed = ps.items AND ps.makeups = 0
        AND NOT EXISTS (SELECT 1 FROM per_stage pv WHERE pv.student_id = ps.student_id AND pv.position = ps.position - 1 AND NOT pv.passed)
      ORDER BY ps.cohort_name NULLS LAST, ps.name, ps.position`,
    { replacements: { schoolId: caller.schoolId, ...scope.replacements }, type: QueryTypes.SELECT },
  );
}
