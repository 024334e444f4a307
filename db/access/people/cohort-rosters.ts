import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import { cohortsTop, type CohortSummary, type CohortMember } from "../cohorts/list-cohorts";

// The People page's cohort rosters: the first `limit` cohorts the caller may see (by start date),
// how many there are in all, and every membership (past ones too) of the cohorts shown, read in
// one query for them all (not one a cohort). Two queries, whatever the number of cohorts.

/** How many cohort rosters the People page shows; the rest are counted. */
export const ROSTERS_SHOWN = 10;

export async function cohortRosters(
  schoolId: string,
  scope: { leadInstructorId?: string },
  limit: number,
): Promise<{ rosters: { cohort: CohortSummary; members: CohortMember[] }[]; total: number }> {
  const { rows: cohorts, total } = await cohortsTop(schoolId, scope, limit);
  const members = cohorts.length
    ? await sequelize.query<CohortMember & { cohortId: string }>(
        `SELECT m.cohort_id AS "cohortId", m.student_id AS "studentId", p.name, p.email, m.from_date AS "fromDate", m.to_date AS "toDate"
           FROM cohort_memberships m JOIN people p ON p.id = m.student_id
          WHERE m.cohort_id IN (:ids)
          ORDER BY p.name, m.from_date`,
        { replacements: { ids: cohorts.map((c) => c.id) }, type: QueryTypes.SELECT },
      )
    : [];
  const byCohort = new Map<string, CohortMember[]>(cohorts.map((c) => [c.id, []]));
  for (const { cohortId, ...m } of members) byCohort.get(cohortId)?.push(m);
  return { rosters: cohorts.map((cohort) => ({ cohort, members: byCohort.get(cohort.id) ?? [] })), total };
}
