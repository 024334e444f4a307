import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../index";

/**
 * Credited ground minutes of a student on a course: the sum over the effective Ground log entry
 * of each session (amendments replace what they amend; absences count zero).
 */
export async function creditedMinutesFor(studentId: string, courseId: string): Promise<number> {
  const [row] = await sequelize.query<{ minutes: number }>(
    `SELECT COALESCE(sum(credited_minutes), 0)::int AS minutes FROM ground_log_current WHERE student_id = :studentId AND course_id = :courseId`,
    { replacements: { studentId, courseId }, type: QueryTypes.SELECT },
  );
  return row?.minutes ?? 0;
}

export { groundHoursFor } from "./ground-log";
