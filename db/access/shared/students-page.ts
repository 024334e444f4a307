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
// in SQL (a first page read from the cohorts in name order without sorting every student in
// scope, see below) with the number that match from one count; the cohorts to filter by from
// one grouped query, at most COHORT_CHOICES_MAX + 1 of them (those two kept per caller while the
// records are unchanged, see below). At most three queries, whatever the size of the school.

export const STUDENTS_PAGE_SIZE = 50;

/**
 * The most members the rows' "head" read (below) should probe: about 2,000 index probes take the
 * time of sorting every one of 10,000 students, so beyond it the list is read by one ORDER BY.
 */
const HEAD_SCAN_MAX = 2000;

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
      sequelize.query<{ n: number; members: number }>(
        `SELECT count(*)::int AS n, (SELECT count(*)::int FROM cohort_memberships cm JOIN cohorts cc ON cc.id = cm.cohort_id
                                      WHERE cc.school_id = :schoolId AND cm.to_date IS NULL) AS members ${from} ${matching}`,
        { replacements, type: QueryTypes.SELECT },
      ),
      sequelize.query<{ id: string; name: string }>(
        `SELECT c.id, c.name ${from} ${where} AND c.id IS NOT NULL AND ${cohortShown} GROUP BY c.id, c.name ORDER BY c.name LIMIT :cohortChoices`,
        { replacements, type: QueryTypes.SELECT },
      ),
    ]);
    return { total: count?.n ?? 0, members: count?.members ?? 0, cohorts };
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
  // The rows, in the order cohort name, student name, id, with the students whose cohort is not
  // named (none current, or not shown to this caller) last by name, id: one query in two parts, so
  // that a page near the start stops after its rows instead of sorting every student in scope.
  // "head": the school's cohorts in name order (the cohorts (school_id, name) index), for each its
  // current members by name (an incremental sort over the presorted cohort name), stopping after
  // offset + limit rows; the scope is asked per member there (probes: no set of every student in
  // scope is built for a page of 50). "tail": the students without a named cohort, by name (the
  // scope read as sets, it reads every student in scope), only when the head ends before the page
  // does (a one-time filter on the head's size): the last pages. A cohort filter names the cohort,
  // so the tail is empty with one. At most one current membership per student (the exclusion
  // constraint), so each student is in one part once, as in a single ORDER BY over all of them.
  const probe = studentScopeSql(caller, purpose, "p.id", { probe: true });
  const probeShown = opts.cohortToStaffOnly ? `(${probe.staffSql})` : "TRUE";
  const person = (scopeSql: string) => `p.school_id = :schoolId AND ${who} AND ${scopeSql} ${enrolledSql}
        AND (CAST(:name AS text) IS NULL OR p.name ILIKE CAST(:name AS text))`;
  const rowsSql = `WITH head AS MATERIALIZED (
        SELECT s.id, s.name, c.name AS "cohortName"
          FROM cohorts c CROSS JOIN LATERAL (
            SELECT p.id, p.name FROM cohort_memberships m JOIN people p ON p.id = m.student_id
             WHERE m.cohort_id = c.id AND m.to_date IS NULL AND ${person(probe.sql)} AND (${probeShown}) IS TRUE) s
         WHERE c.school_id = :schoolId
           AND (CAST(:cohortId AS uuid) IS NULL OR c.id = CAST(:cohortId AS uuid))
           AND (CAST(:cohortName AS text) IS NULL OR c.name ILIKE CAST(:cohortName AS text))
         ORDER BY c.name, s.name, s.id LIMIT :reach),
      tail AS (
        SELECT p.id, p.name ${from}
         WHERE (SELECT count(*) FROM head) < :reach AND CAST(:cohortId AS uuid) IS NULL AND CAST(:cohortName AS text) IS NULL
           AND ${person(scope.sql)} AND NOT (c.id IS NOT NULL AND (${cohortShown}) IS TRUE)
         ORDER BY p.name, p.id LIMIT :reach)
      SELECT id, name, "cohortName" FROM (
        SELECT 0 AS part, id, name, "cohortName" FROM head UNION ALL SELECT 1, id, name, NULL FROM tail) r
       ORDER BY part, "cohortName", name, id LIMIT :limit OFFSET :offset`;
  const offset = (page - 1) * pageSize;
  const reach = offset + pageSize;
  // The single ORDER BY over every student in scope: the last pages, a part of a name typed alone
  // (its count is computed afresh anyway) and a scope thin in the school (a sponsor, a student, an
  // instructor with few students), where the head would probe many members to fill its rows.
  const sortedSql = `SELECT p.id, p.name, CASE WHEN ${cohortShown} THEN c.name END AS "cohortName" ${from} ${matching}
        ORDER BY 3 NULLS LAST, p.name, p.id LIMIT :limit OFFSET :offset`;
  const readRows = (sql: string) =>
    sequelize.query<ListedStudent>(sql, {
      replacements: { ...replacements, ...probe.replacements, limit: pageSize, offset, reach },
      type: QueryTypes.SELECT,
    });
  const summary = () =>
    typed
      ? countAndCohorts()
      : cachedSummary(
          caller.schoolId,
          key,
          countAndCohorts,
          (v) => v as { total: number; members?: number; cohorts: { id: string; name: string }[] },
        );
  // A cohort chosen: the head reads only its members. A part of a cohort's name: only the members
  // of the cohorts that match, up to the first HEAD_SCAN_MAX rows. A part of a student's name alone,
  // or deeper: the single ORDER BY (how many match is not known before the count, computed afresh
  // for a typed filter). Either is read beside the count.
  if (filter.cohortId || filter.cohortName || filter.name) {
    const byHead = Boolean(filter.cohortId) || (Boolean(filter.cohortName) && reach <= HEAD_SCAN_MAX);
    const [rows, { total, cohorts }] = await Promise.all([readRows(byHead ? rowsSql : sortedSql), summary()]);
    return { rows, total, page, pageSize, cohorts };
  }
  // Otherwise the count (kept) comes first and says which read is cheaper: the head probes about
  // reach × (the school's current members / the students listed) members before its page is full.
  const { total, members, cohorts } = await summary();
  const headScans = members === undefined ? Infinity : (reach * members) / Math.max(total, 1);
  const rows = await readRows(headScans <= HEAD_SCAN_MAX ? rowsSql : sortedSql);
  return { rows, total, page, pageSize, cohorts };
}
