import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";

/**
 * The one sum of a student's credited ground minutes on a course: the effective Ground log entry
 * of each session (amendments replace what they amend; absences count zero) plus the minutes
 * credited by transfer from an earlier school (transfer_credits, capped by 14 CFR 141.77(c)).
 * Every total of ground hours in the product reads this (`creditedMinutesFor`, `groundHoursFor`).
 */
const TOTAL_SQL = `SELECT (COALESCE((SELECT sum(credited_minutes) FROM ground_log_current WHERE student_id = :s AND course_id = :c), 0)
        + COALESCE((SELECT sum(credited_minutes) FROM transfer_credits WHERE student_id = :s AND course_id = :c), 0))::int AS minutes,
       COALESCE((SELECT sum(credited_minutes) FROM transfer_credits WHERE student_id = :s AND course_id = :c), 0)::int AS transfer`;

/** Pass the caller's transaction to count what it has written (e.g. an endorsement's precondition). */
export async function creditedMinutesFor(studentId: string, courseId: string, t?: Transaction): Promise<number> {
  const [row] = await sequelize.query<{ minutes: number }>(TOTAL_SQL, {
    replacements: { s: studentId, c: courseId },
    type: QueryTypes.SELECT,
    transaction: t,
  });
  return row?.minutes ?? 0;
}

export interface StageHours {
  stageCode: string | null;
  stageTitle: string;
  minutes: number;
}

export interface GroundHours {
  courseId: string;
  courseCode: string;
  courseTitle: string;
  minimumMinutes: number;
  creditedMinutes: number;
  /** of which credited by transfer from an earlier school (also a row of byStage) */
  transferMinutes: number;
  byStage: StageHours[];
}

/**
 * Credited minutes per stage and for the course. An entry whose syllabus items fall in several
 * stages is shared equally among them; one with no items counts under "Not tied to a stage";
 * minutes credited by transfer count on a row of their own, so the rows add up to the total.
 */
export async function groundHoursFor(studentId: string, courseId: string): Promise<GroundHours | null> {
  const [course] = await sequelize.query<{ code: string; title: string; min: number }>(
    `SELECT code, title, min_ground_minutes AS min FROM courses WHERE id = :c`,
    { replacements: { c: courseId }, type: QueryTypes.SELECT },
  );
  if (!course) return null;
  const stages = await sequelize.query<{ stageCode: string | null; stageTitle: string | null; minutes: number }>(
    `WITH cur AS (SELECT entry_id, credited_minutes, syllabus_item_ids FROM ground_log_current WHERE student_id = :s AND course_id = :c),
          st AS (SELECT cur.entry_id, cur.credited_minutes, ss.code, ss.title, min(ss.position) AS pos
                   FROM cur LEFT JOIN syllabus_items i ON i.id = ANY(cur.syllabus_item_ids) LEFT JOIN syllabus_stages ss ON ss.id = i.stage_id
                  GROUP BY cur.entry_id, cur.credited_minutes, ss.code, ss.title),
          shared AS (SELECT st.*, st.credited_minutes::numeric / count(*) OVER (PARTITION BY st.entry_id) AS share FROM st)
     SELECT code AS "stageCode", title AS "stageTitle", round(sum(share))::int AS minutes, min(pos) AS pos
       FROM shared GROUP BY code, title ORDER BY min(pos) NULLS LAST, code`,
    { replacements: { s: studentId, c: courseId }, type: QueryTypes.SELECT },
  );
  const [total] = await sequelize.query<{ minutes: number; transfer: number }>(TOTAL_SQL, {
    replacements: { s: studentId, c: courseId },
    type: QueryTypes.SELECT,
  });
  const transfer = total?.transfer ?? 0;
  return {
    courseId,
    courseCode: course.code,
    courseTitle: course.title,
    minimumMinutes: course.min,
    creditedMinutes: total?.minutes ?? 0,
    transferMinutes: transfer,
    byStage: [
      ...stages.map((r) => ({ stageCode: r.stageCode, stageTitle: r.stageTitle ?? "Not tied to a stage", minutes: r.minutes })),
      ...(transfer > 0 ? [{ stageCode: null, stageTitle: "Credited by transfer", minutes: transfer }] : []),
    ],
  };
}
