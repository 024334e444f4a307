import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/can";
import { HttpError } from "@/lib/http/errors";
import { now } from "@/lib/clock";
import { dateInZone } from "@/lib/time";
import { passRateWindow } from "@/lib/endorsements/rules";
import { getSchool } from "../shared/school";

// First-attempt pass rate per course over the last 24 calendar months (14 CFR 141.5(d): a school
// keeps 80 % or better). A first attempt is a student's earliest result on a course, ever; it
// counts when it falls in the window. One aggregate query.

export interface PassRateRow {
  courseId: string;
  courseCode: string;
  courseTitle: string;
  firstAttempts: number;
  passed: number;
  ratePercent: number | null;
}

export async function passRateByCourse(schoolId: string, window: { from: string; to: string }): Promise<PassRateRow[]> {
  const rows = await sequelize.query<PassRateRow & { ratePercent: string | null }>(
    `WITH firsts AS (
       SELECT DISTINCT ON (r.student_id, r.course_id) r.course_id, r.passed, r.taken_on
         FROM knowledge_test_results r WHERE r.school_id = :school
        ORDER BY r.student_id, r.course_id, r.taken_on, r.created_at)
     SELECT c.id AS "courseId", c.code AS "courseCode", c.title AS "courseTitle",
            count(f.course_id)::int AS "firstAttempts", count(f.course_id) FILTER (WHERE f.passed)::int AS passed,
            round(100.0 * count(f.course_id) FILTER (WHERE f.passed) / NULLIF(count(f.course_id), 0), 1) AS "ratePercent"
       FROM courses c LEFT JOIN firsts f ON f.course_id = c.id AND f.taken_on BETWEEN CAST(:from AS date) AND CAST(:to AS date)
      WHERE c.school_id = :school
      GROUP BY c.id, c.code, c.title ORDER BY c.code`,
    { replacements: { school: schoolId, ...window }, type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({ ...r, ratePercent: r.ratePercent === null ? null : Number(r.ratePercent) }));
}

/** The report for the caller's school over the window ending today (reports.view). */
export async function passRateReport(user: CurrentUser) {
  if (!can(user, "reports.view")) throw new HttpError(403, "You may not see reports");
  const school = await getSchool(user.schoolId);
  const window = passRateWindow(dateInZone(now(), school.timeZone));
  return { window, rows: await passRateByCourse(user.schoolId, window) };
}
