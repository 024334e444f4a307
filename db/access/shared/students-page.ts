import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import { studentScopeSql, type Caller, type ScopePurpose } from "./student-scope";
import { cachedSummary } from "./summary-cache";
import { STUDENT_ROLES } from "@/lib/auth/account-roles";
import { COHORT_CHOICES_MAX } from "@/lib/records/schema";
import { containsPattern } from "./like";

// Every list of students that grows with the school, one page at a time (Records, the Progress
// map list, the Ground log's student list): the students the caller may see for a purpose
// (active, with an active enrolment, unless asked for every student account), filtered by cohort
// (or a part of its name) and by a part of the student's name, ordered by cohort then name, paged
// in SQL (LIMIT/OFFSET) with the number that match from one count; the cohorts to filter by from
// one grouped query, at most COHORT_CHOICES_MAX + 1 of them (those two kept per caller while the
// records are unchanged, see below). At most three queries, whatever the size of the school.

export const STUDENTS_PAGE_SIZE = 50;

export interface ListedStudent {
  id: string;
  name: string;
  cohortName: string | null;
}

export interface StudentsFilter {
  cohortId?: string | undefined;
  /** a part of the cohort's name, any case (the filter of a school with many cohorts) */
  cohortName?: string | undefined;
  /** a part of the student's name, any case */
  name?: string | undefined;
}

export interface StudentsPage {
  rows: ListedStudent[];
  /** how many students match the filter */
  total: number;
  page: number;
  pageSize: number;
  /**
   * the cohorts of the students the caller may see (not only the filtered ones), at most
   * COHORT_CHOICES_MAX + 1: more than COHORT_CHOICES_MAX means "too many to offer as choices"
   */
  cohorts: { id: string; name: string }[];
}

export interface StudentsPageOptions {
  page?: number;
  pageSize?: number;
  /**
   * "enrolled" (default): active people with an active enrolment. "accounts": every student account
   * of the school the scope allows, enrolled or not (the Ground log keeps ended trainings).
   */
  who?: "enrolled" | "accounts";
  /** with "enrolled": deactivated accounts too (the end of training may still be recorded for them) */
  includeInactive?: boolean;
  /** name the cohort only to staff (a sponsor or the student sees no cohort names) */
  cohortToStaffOnly?: boolean;
}

export async function studentsPage(
  caller: Caller,
  purpose: ScopePurpose,
  filter: StudentsFilter = {},
  opts: StudentsPageOptions = {},
): Promise<StudentsPage> {
  const scope = studentScopeSql(caller, purpose, "p.id");
  const pageSize = opts.pageSize ?? STUDENTS_PAGE_SIZE;
  const page = Math.max(1, Math.floor(opts.page ?? 1));
  const replacements = {
    schoolId: caller.schoolId,
    studentRoles: STUDENT_ROLES,
    ...scope.replacements,
    cohortId: filter.cohortId ?? null,
    name: filter.name ? containsPattern(filter.name) : null,
    cohortName: filter.cohortName ? containsPattern(filter.cohortName) : null,
    cohortChoices: COHORT_CHOICES_MAX + 1,
  };
  const enrolled = (opts.who ?? "enrolled") === "enrolled";
  const from = `FROM people p
       LEFT JOIN cohort_memberships m ON m.student_id = p.id AND m.to_date IS NULL LEFT JOIN cohorts c ON c.id = m.cohort_id`;
  // enrolled: an active enrolment exists (what joining active_enrolments meant here, read by an index
  // probe per student instead of the view's DISTINCT ON over every enrolment of the school)
  const enrolledSql = enrolled ? "AND EXISTS (SELECT 1 FROM enrolments e WHERE e.student_id = p.id AND e.status = 'active')" : "";
  const cohortShown = opts.cohortToStaffOnly ? `(${scope.staffSql})` : "TRUE";
  const studentAccount = "p.roles && ARRAY[:studentRoles]::text[]";
  const who = enrolled && !opts.includeInactive ? "p.active" : studentAccount;
  const where = `WHERE p.school_id = :schoolId AND ${who} AND ${scope.sql} ${enrolledSql}`;
  const matching = `${where}
        AND (CAST(:cohortId AS uuid) IS NULL OR (m.cohort_id = CAST(:cohortId AS uuid) AND ${cohortShown}))
        AND (CAST(:cohortName AS text) IS NULL OR (c.name ILIKE CAST(:cohortName AS text) AND ${cohortShown}))
        AND (CAST(:name AS text) IS NULL OR p.name ILIKE CAST(:name AS text))`;
  // The count and the cohort choices read every student in scope; without a typed filter (the list
  // as first opened, a cohort chosen) they are kept per caller while the records are unchanged
  // (cachedSummary). A typed part of a name is counted afresh (not kept: one row per search).
  const countAndCohorts = async () => {
    const [[count], cohorts] = await Promise.all([
      sequelize.query<{ n: number }>(`SELECT count(*)::int AS n ${from} ${matching}`, { replacements, type: QueryTypes.SELECT }),
      sequelize.query<{ id: string; name: string }>(
        `SELECT c.id, c.name ${from} ${where} AND c.id IS NOT NULL AND ${cohortShown} GROUP BY c.id, c.name ORDER BY c.name LIMIT :cohortChoices`,
        { replacements, type: QueryTypes.SELECT },
      ),
    ]);
    return { total: count?.n ?? 0, cohorts };
  };
  const typed = Boolean(filter.name || filter.cohortName);
  const key = [
    "students-count",
    purpose,
    caller.id,
    [...caller.roles].sort().join(","),
    opts.who ?? "enrolled",
    opts.includeInactive ? "inactive" : "active",
    opts.cohortToStaffOnly ? "staff-cohorts" : "cohorts",
    filter.cohortId ?? "",
  ].join(":");
  const [rows, { total, cohorts }] = await Promise.all([
    sequelize.query<ListedStudent>(
      `SELECT p.id, p.name, CASE WHEN ${cohortShown} THEN c.name END AS "cohortName" ${from} ${matching}
        ORDER BY 3 NULLS LAST, p.name, p.id LIMIT :limit OFFSET :offset`,
      { replacements: { ...replacements, limit: pageSize, offset: (page - 1) * pageSize }, type: QueryTypes.SELECT },
    ),
    typed
      ? countAndCohorts()
      : cachedSummary(caller.schoolId, key, countAndCohorts, (v) => v as { total: number; cohorts: { id: string; name: string }[] }),
  ]);
  return { rows, total, page, pageSize, cohorts };
}
