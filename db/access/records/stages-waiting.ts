import "server-only";
import { cache } from "react";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import { studentScopeSql, type Caller } from "../shared/student-scope";
import { cachedSummary, reviveDate } from "../shared/summary-cache";

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
  // Starts from the sign-offs, not from every student times every item: a stage can only be
  // waiting when all of its items carry a current sign-off, so the school's current sign-offs
  // are counted per student and stage once (hashed), and only the stages that come out complete
  // meet the per-row checks (scope, passed, make-ups, the previous stage). At 15,000 students
  // with a stage each waiting this took 0.6 s where counting every item of every student took 4 s.
  return {
    sql: `WITH cur AS (
       SELECT s.id, s.student_id, s.syllabus_item_id, s.signed_at FROM sign_offs s
        WHERE s.school_id = :schoolId
          AND NOT EXISTS (SELECT 1 FROM sign_offs later WHERE later.student_id = s.student_id
                             AND later.syllabus_item_id = s.syllabus_item_id AND later.generation > s.generation)
          AND NOT EXISTS (SELECT 1 FROM sign_off_withdrawals w WHERE w.sign_off_id = s.id)
     ), signed AS (
       SELECT cur.student_id, i.stage_id, count(*) AS signed, max(cur.signed_at) AS since
         FROM cur JOIN syllabus_items i ON i.id = cur.syllabus_item_id
        GROUP BY cur.student_id, i.stage_id
     ), stage_size AS (
       SELECT i.stage_id, count(*) AS items FROM syllabus_items i GROUP BY i.stage_id
     ), complete AS (
       SELECT sg.student_id, sg.stage_id, sg.since FROM signed sg JOIN stage_size z ON z.stage_id = sg.stage_id AND z.items = sg.signed
     )
     SELECT p.id AS "studentId", p.name AS "studentName", g.code AS "stageCode", cp.since,
            c.name AS "cohortName", g.position
       FROM complete cp
       JOIN people p ON p.id = cp.student_id
       JOIN active_enrolments e ON e.student_id = p.id
       JOIN syllabus_stages g ON g.id = cp.stage_id AND g.revision_id = e.revision_id
       LEFT JOIN cohort_memberships m ON m.student_id = p.id AND m.to_date IS NULL LEFT JOIN cohorts c ON c.id = m.cohort_id
      WHERE p.school_id = :schoolId AND p.active AND ${scope.sql}
        AND NOT EXISTS (SELECT 1 FROM stage_checks sc WHERE sc.student_id = p.id AND sc.enrolment_id = e.id
                                                       AND sc.stage_id = g.id AND sc.result = 'pass')
        AND NOT EXISTS (SELECT 1 FROM makeup_items mi JOIN syllabus_items i ON i.id = mi.syllabus_item_id
                         WHERE mi.student_id = p.id AND i.stage_id = g.id AND mi.state IN ('open','scheduled'))
        AND NOT EXISTS (SELECT 1 FROM syllabus_stages pg
                         WHERE pg.revision_id = g.revision_id AND pg.position = g.position - 1
                           AND EXISTS (SELECT 1 FROM syllabus_items pi WHERE pi.stage_id = pg.id)
                           AND NOT EXISTS (SELECT 1 FROM stage_checks sc WHERE sc.student_id = p.id AND sc.enrolment_id = e.id
                                                                          AND sc.stage_id = pg.id AND sc.result = 'pass'))`,
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
 * longest (every item signed off longest ago first), counted and limited in SQL. Kept per caller
 * while the school's records are unchanged (cachedSummary: counting 10,000 waiting stages takes
 * about 0.25 s) and read once per page render (React `cache`): the chief who also teaches has it
 * in the Records card and in "Checks due", from the same caller object.
 */
export const stagesWaitingTop = cache(async function stagesWaitingTop(
  caller: Caller,
  limit: number,
): Promise<{ total: number; top: StageWaiting[] }> {
  const key = `stages-waiting:${limit}:${caller.id}:${[...caller.roles].sort().join(",")}`;
  return cachedSummary(
    caller.schoolId,
    key,
    async () => {
      const q = stagesWaitingSql(caller);
      const rows = await sequelize.query<StageWaiting & { total: number }>(
        `SELECT w."studentId", w."studentName", w."stageCode", w.since, (count(*) OVER ())::int AS total FROM (${q.sql}) w
          ORDER BY w.since ASC NULLS LAST, w."studentName", w.position
          LIMIT :limit`,
        { replacements: { ...q.replacements, limit }, type: QueryTypes.SELECT },
      );
      const top = rows.map((r) => ({ studentId: r.studentId, studentName: r.studentName, stageCode: r.stageCode, since: r.since }));
      return { total: rows[0]?.total ?? 0, top };
    },
    (stored) => {
      const v = stored as { total: number; top: (Omit<StageWaiting, "since"> & { since: string | null })[] };
      return { total: v.total, top: v.top.map((w) => ({ ...w, since: reviveDate(w.since) })) };
    },
  );
});
