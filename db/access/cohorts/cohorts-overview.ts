import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";

export interface CohortOverview {
  id: string;
  name: string;
  courseCode: string;
  leadName: string;
  startsOn: string;
  closedOn: string | null;
  members: { id: string; name: string; fromDate: string }[];
}

/** The Cohorts page: every cohort of the school with today's members, and the choices its forms offer. */
export async function cohortsOverview(user: CurrentUser) {
  const rep = { replacements: { s: user.schoolId }, type: QueryTypes.SELECT as const };
  const [cohorts, members, courses, instructors, students] = await Promise.all([
    sequelize.query<Omit<CohortOverview, "members">>(
      `SELECT c.id, c.name, co.code AS "courseCode", p.name AS "leadName", c.starts_on::text AS "startsOn", c.closed_on::text AS "closedOn"
         FROM cohorts c JOIN courses co ON co.id = c.course_id JOIN people p ON p.id = c.lead_instructor_id
        WHERE c.school_id = :s ORDER BY c.closed_on IS NOT NULL, c.starts_on DESC, c.name`,
      rep,
    ),
    sequelize.query<{ cohortId: string; id: string; name: string; fromDate: string }>(
      `SELECT m.cohort_id AS "cohortId", p.id, p.name, m.from_date::text AS "fromDate"
         FROM cohort_memberships m JOIN cohorts c ON c.id = m.cohort_id JOIN people p ON p.id = m.student_id
        WHERE c.school_id = :s AND m.from_date <= current_date AND (m.to_date IS NULL OR m.to_date > current_date) ORDER BY p.name`,
      rep,
    ),
    sequelize.query<{ id: string; name: string }>(
      `SELECT id, code || ' ' || title AS name FROM courses WHERE school_id = :s ORDER BY code`,
      rep,
    ),
    sequelize.query<{ id: string; name: string }>(
      `SELECT id, name FROM people WHERE school_id = :s AND active AND 'instructor' = ANY(roles) ORDER BY name`,
      rep,
    ),
    sequelize.query<{ id: string; name: string }>(
      `SELECT id, name FROM people WHERE school_id = :s AND active AND 'student' = ANY(roles) ORDER BY name`,
      rep,
    ),
  ]);
  const byCohort = new Map<string, CohortOverview["members"]>();
  for (const m of members)
    (byCohort.get(m.cohortId) ?? byCohort.set(m.cohortId, []).get(m.cohortId)!).push({ id: m.id, name: m.name, fromDate: m.fromDate });
  return {
    cohorts: cohorts.map((c) => ({ ...c, members: byCohort.get(c.id) ?? [] })),
    courses,
    instructors,
    students,
  };
}
