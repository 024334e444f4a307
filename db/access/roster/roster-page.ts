import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import { getSchool } from "../shared/school";
import { STUDENTS_PAGE_SIZE } from "../shared/students-page";
import { COHORT_CHOICES_MAX } from "@/lib/records/schema";
import { dateInZone } from "@/lib/time";
import { now } from "@/lib/clock";
import { can } from "@/lib/auth/can";
import type { CurrentUser } from "@/lib/auth/session";
import { containsPattern } from "../shared/like";

// The Roster, one page at a time: the students in the cohorts the caller leads (with `roster.all`:
// every cohort) today, filtered by cohort (or a part of its name) and by a part of the student's
// name, ordered by cohort then name, paged in SQL (LIMIT/OFFSET) with the number that match from
// one count; each row's cohort history and sponsors are read for the page's rows only, and the
// cohorts to filter by are at most COHORT_CHOICES_MAX + 1. Four queries (the school, then three),
// whatever the size of the school.

export interface RosterRow {
  studentId: string;
  name: string;
  email: string;
  cohortId: string;
  cohortName: string;
  courseCode: string;
  leadInstructorName: string;
  startsOn: string;
  /** how many students the cohort has today (all of them, not only this page's) */
  cohortSize: number;
  fromDate: string;
  /** every membership of this student, oldest first */
  history: { cohortName: string; fromDate: string; toDate: string | null }[];
  sponsors: string[];
}

export interface RosterFilter {
  cohortId?: string | undefined;
  /** a part of the cohort's name, any case */
  cohortName?: string | undefined;
  /** a part of the student's name, any case */
  name?: string | undefined;
}

export interface RosterPage {
  rows: RosterRow[];
  total: number;
  page: number;
  pageSize: number;
  /** the caller's cohorts by name, at most COHORT_CHOICES_MAX + 1 (more means "filter by a part of the name") */
  cohorts: { id: string; name: string }[];
}

export async function rosterPage(
  user: CurrentUser,
  filter: RosterFilter = {},
  opts: { page?: number; pageSize?: number } = {},
): Promise<RosterPage> {
  const pageSize = opts.pageSize ?? STUDENTS_PAGE_SIZE;
  const page = Math.max(1, Math.floor(opts.page ?? 1));
  const today = dateInZone(now(), (await getSchool(user.schoolId)).timeZone);
  const replacements = {
    schoolId: user.schoolId,
    all: can(user, "roster.all"),
    uid: user.id,
    today,
    cohortId: filter.cohortId ?? null,
    cohortName: filter.cohortName ? containsPattern(filter.cohortName) : null,
    name: filter.name ? containsPattern(filter.name) : null,
    cohortChoices: COHORT_CHOICES_MAX + 1,
  };
  const current = `m.from_date <= CAST(:today AS date) AND (m.to_date IS NULL OR m.to_date > CAST(:today AS date))`;
  const matching = `FROM cohort_memberships m JOIN cohorts c ON c.id = m.cohort_id JOIN people p ON p.id = m.student_id
      WHERE c.school_id = :schoolId AND ${current} AND (:all OR c.lead_instructor_id = :uid)
        AND (CAST(:cohortId AS uuid) IS NULL OR c.id = CAST(:cohortId AS uuid))
        AND (CAST(:cohortName AS text) IS NULL OR c.name ILIKE CAST(:cohortName AS text))
        AND (CAST(:name AS text) IS NULL OR p.name ILIKE CAST(:name AS text))`;
  const order = `ORDER BY "startsOn", "cohortName", "cohortId", name, "studentId"`;
  const [rows, [count], cohorts] = await Promise.all([
    sequelize.query<RosterRow>(
      `WITH page AS (
         SELECT p.id AS "studentId", p.name, p.email, c.id AS "cohortId", c.name AS "cohortName", c.starts_on AS "startsOn",
                c.course_id, c.lead_instructor_id, m.from_date AS "fromDate"
           ${matching}
          ${order} LIMIT :limit OFFSET :offset)
       SELECT pg."studentId", pg.name, pg.email, pg."cohortId", pg."cohortName", pg."startsOn", pg."fromDate",
              co.code AS "courseCode", lp.name AS "leadInstructorName",
              (SELECT count(*)::int FROM cohort_memberships m WHERE m.cohort_id = pg."cohortId" AND ${current}) AS "cohortSize",
              (SELECT json_agg(json_build_object('cohortName', hc.name, 'fromDate', hm.from_date, 'toDate', hm.to_date) ORDER BY hm.from_date)
                 FROM cohort_memberships hm JOIN cohorts hc ON hc.id = hm.cohort_id WHERE hm.student_id = pg."studentId") AS history,
              COALESCE((SELECT array_agg(sp.name ORDER BY sp.name) FROM sponsor_links l JOIN people sp ON sp.id = l.sponsor_id
                         WHERE l.student_id = pg."studentId"), '{}') AS sponsors
         FROM page pg JOIN courses co ON co.id = pg.course_id JOIN people lp ON lp.id = pg.lead_instructor_id
        ${order}`,
      { replacements: { ...replacements, limit: pageSize, offset: (page - 1) * pageSize }, type: QueryTypes.SELECT },
    ),
    sequelize.query<{ n: number }>(`SELECT count(*)::int AS n ${matching}`, { replacements, type: QueryTypes.SELECT }),
    sequelize.query<{ id: string; name: string }>(
      `SELECT id, name FROM cohorts WHERE school_id = :schoolId AND (:all OR lead_instructor_id = :uid) ORDER BY name, id LIMIT :cohortChoices`,
      { replacements, type: QueryTypes.SELECT },
    ),
  ]);
  return { rows, total: count?.n ?? 0, page, pageSize, cohorts };
}
