import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../index";

/**
 * Credited ground minutes of a student on a course. Until the Ground log exists
 * (its migration creates `ground_log_entries`), this is zero.
 */
export async function creditedMinutesFor(studentId: string, courseId: string): Promise<number> {
  const [exists] = await sequelize.query<{ ok: boolean }>(`SELECT to_regclass('public.ground_log_entries') IS NOT NULL AS ok`, { type: QueryTypes.SELECT });
  if (!exists?.ok) return 0;
  const [row] = await sequelize.query<{ minutes: number }>(
    `SELECT COALESCE(sum(credited_minutes), 0)::int AS minutes FROM ground_log_current WHERE student_id = :studentId AND course_id = :courseId`,
    { replacements: { studentId, courseId }, type: QueryTypes.SELECT },
  );
  return row?.minutes ?? 0;
}
