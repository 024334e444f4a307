import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { cohortChoices } from "../directory/cohorts";
import { studentChoices } from "../directory/students";
import { instructorChoices } from "../directory/instructors";
import { getSchool } from "../shared/school";
import { now } from "@/lib/clock";
import { dateInZone } from "@/lib/time";
import { containsPattern } from "../shared/like";

export const COHORTS_PAGE_SIZE = 50;
/** the names of a cohort's students shown in its row; the count says how many there are in all */
export const MEMBERS_SHOWN = 12;

export interface CohortOverview {
  id: string;
  name: string;
  courseCode: string;
  leadName: string;
  startsOn: string;
  closedOn: string | null;
  /** the first MEMBERS_SHOWN of today's students, by name */
  members: { id: string; name: string; fromDate: string }[];
  /** how many students the cohort has today */
  memberCount: number;
}

/**
 * The Cohorts page: one page of the school's cohorts (open ones first, newest first, a part of the
 * name to narrow them, paged in SQL with the number that match from one count), each with today's
 * students (the first MEMBERS_SHOWN names and the count), and the choices its forms offer. Seven
 * queries (the school's time zone is one), whatever the size of the school.
 */
export async function cohortsOverview(
  user: CurrentUser,
  filter: { name?: string | undefined } = {},
  opts: { page?: number; pageSize?: number } = {},
) {
  const pageSize = opts.pageSize ?? COHORTS_PAGE_SIZE;
  const page = Math.max(1, Math.floor(opts.page ?? 1));
  const rep = { replacements: { s: user.schoolId }, type: QueryTypes.SELECT as const };
  // "today" is the school's date (its time zone, by the app's clock), as for every dated membership
  const today = dateInZone(now(), (await getSchool(user.schoolId)).timeZone);
  const list = {
    replacements: { s: user.schoolId, name: filter.name ? containsPattern(filter.name) : null, shown: MEMBERS_SHOWN, today },
    type: QueryTypes.SELECT as const,
  };
  const matching = `FROM cohorts c WHERE c.school_id = :s AND (CAST(:name AS text) IS NULL OR c.name ILIKE CAST(:name AS text))`;
  const current = `m.from_date <= CAST(:today AS date) AND (m.to_date IS NULL OR m.to_date > CAST(:today AS date))`;
  const [cohorts, [count], openCohorts, courses, instructors, students] = await Promise.all([
    sequelize.query<CohortOverview>(
      `WITH page AS (
         SELECT c.id, c.name, c.course_id, c.lead_instructor_id, c.starts_on, c.closed_on ${matching}
          ORDER BY c.closed_on IS NOT NULL, c.starts_on DESC, c.name, c.id LIMIT :limit OFFSET :offset)
       SELECT c.id, c.name, co.code AS "courseCode", p.name AS "leadName", c.starts_on::text AS "startsOn", c.closed_on::text AS "closedOn",
              COALESCE((SELECT json_agg(json_build_object('id', x.id, 'name', x.name, 'fromDate', x.from_date) ORDER BY x.name, x.id)
                          FROM (SELECT sp.id, sp.name, m.from_date::text AS from_date FROM cohort_memberships m JOIN people sp ON sp.id = m.student_id
                                 WHERE m.cohort_id = c.id AND ${current} ORDER BY sp.name, sp.id LIMIT :shown) x), '[]') AS members,
              (SELECT count(*)::int FROM cohort_memberships m WHERE m.cohort_id = c.id AND ${current}) AS "memberCount"
         FROM page c JOIN courses co ON co.id = c.course_id JOIN people p ON p.id = c.lead_instructor_id
        ORDER BY c.closed_on IS NOT NULL, c.starts_on DESC, c.name, c.id`,
      { ...list, replacements: { ...list.replacements, limit: pageSize, offset: (page - 1) * pageSize } },
    ),
    sequelize.query<{ n: number }>(`SELECT count(*)::int AS n ${matching}`, list),
    // the Add or move form's choices: listed while few, else its search pickers (db/access/directory)
    cohortChoices(user, "placing"),
    sequelize.query<{ id: string; name: string }>(
      `SELECT id, code || ' ' || title AS name FROM courses WHERE school_id = :s ORDER BY code`,
      rep,
    ),
    // the New cohort form's lead: listed while few, else searched
    instructorChoices(user, "cohorts"),
    studentChoices(user, "cohorts"),
  ]);
  return { cohorts, total: count?.n ?? 0, page, pageSize, openCohorts, courses, instructors, students };
}
