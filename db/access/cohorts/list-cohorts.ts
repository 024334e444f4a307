import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";

export interface CohortSummary {
  id: string;
  name: string;
  courseCode: string;
  leadInstructorId: string;
  leadInstructorName: string;
  startsOn: string;
  memberCount: number;
}

const COHORTS = `SELECT c.id, c.name, co.code AS "courseCode", c.lead_instructor_id AS "leadInstructorId", p.name AS "leadInstructorName",
            c.starts_on AS "startsOn",
            (SELECT count(*)::int FROM cohort_memberships m WHERE m.cohort_id = c.id AND m.to_date IS NULL) AS "memberCount"`;
const FROM = `FROM cohorts c JOIN courses co ON co.id = c.course_id JOIN people p ON p.id = c.lead_instructor_id
      WHERE c.school_id = :schoolId AND (:lead::uuid IS NULL OR c.lead_instructor_id = :lead::uuid)`;

/** Cohorts the caller may see: all of the school's for `all`, else those the instructor leads. */
export async function listCohorts(schoolId: string, scope: { leadInstructorId?: string } = {}): Promise<CohortSummary[]> {
  return sequelize.query<CohortSummary>(`${COHORTS} ${FROM} ORDER BY c.starts_on, c.name`, {
    replacements: { schoolId, lead: scope.leadInstructorId ?? null },
    type: QueryTypes.SELECT,
  });
}

/** The first `limit` of those cohorts (the same order) and how many there are in all, in one query. */
export async function cohortsTop(
  schoolId: string,
  scope: { leadInstructorId?: string },
  limit: number,
): Promise<{ rows: CohortSummary[]; total: number }> {
  const rows = await sequelize.query<CohortSummary & { total: number }>(
    `${COHORTS}, count(*) OVER ()::int AS total ${FROM} ORDER BY c.starts_on, c.name, c.id LIMIT :limit`,
    { replacements: { schoolId, lead: scope.leadInstructorId ?? null, limit }, type: QueryTypes.SELECT },
  );
  const total = rows[0]?.total ?? 0;
  for (const r of rows) delete (r as Partial<typeof r>).total;
  return { rows, total };
}

export interface CohortMember {
  studentId: string;
  name: string;
  email: string;
  fromDate: string;
  toDate: string | null;
}

export async function listCohortMembers(cohortId: string, includePast = false): Promise<CohortMember[]> {
  return sequelize.query<CohortMember>(
    `SELECT m.student_id AS "studentId", p.name, p.email, m.from_date AS "fromDate", m.to_date AS "toDate"
       FROM cohort_memberships m JOIN people p ON p.id = m.student_id
      WHERE m.cohort_id = :cohortId AND (:includePast OR m.to_date IS NULL)
      ORDER BY p.name`,
    { replacements: { cohortId, includePast }, type: QueryTypes.SELECT },
  );
}
