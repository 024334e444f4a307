import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { listLockedAccounts } from "../people/sign-in-locks";
import { recencyDueSoon } from "../people/qualification-reads";
import { getSchool } from "../shared/school";
import { now } from "@/lib/clock";
import { dateInZone } from "@/lib/time";

/** The chief's Today warns this many days before an instructor's recency date. */
export const RECENCY_WARNING_DAYS = 30;

/** The school's overview on the Today page: head counts, instructor currency and locked sign-ins. */
export async function schoolOverview(user: Pick<CurrentUser, "schoolId">) {
  const [counts] = await sequelize.query<{ students: number; instructors: number; sponsors: number; cohorts: number }>(
    `SELECT count(*) FILTER (WHERE 'student' = ANY(roles))::int AS students,
            count(*) FILTER (WHERE 'instructor' = ANY(roles))::int AS instructors,
            count(*) FILTER (WHERE 'sponsor' = ANY(roles))::int AS sponsors,
            (SELECT count(*)::int FROM cohorts WHERE school_id = :s) AS cohorts
       FROM people WHERE school_id = :s AND active`,
    { replacements: { s: user.schoolId }, type: QueryTypes.SELECT },
  );
  const locked = await listLockedAccounts(user.schoolId);
  const today = dateInZone(now(), (await getSchool(user.schoolId)).timeZone);
  const currency = await sequelize.query<{ name: string; certificateNumber: string; dueOn: string; overdue: boolean }>(
    `SELECT p.name, q.certificate_number AS "certificateNumber",
            (q.recency_on + make_interval(months => q.recency_months))::date AS "dueOn",
            (q.recency_on + make_interval(months => q.recency_months))::date < CAST(:today AS date) AS overdue
       FROM instructor_qualifications_current q JOIN people p ON p.id = q.person_id
      WHERE p.school_id = :s ORDER BY 3`,
    { replacements: { s: user.schoolId, today }, type: QueryTypes.SELECT },
  );
  const dueSoon = await recencyDueSoon(user.schoolId, today, RECENCY_WARNING_DAYS);
  return { counts: counts ?? { students: 0, instructors: 0, sponsors: 0, cohorts: 0 }, locked, currency, dueSoon, today };
}
