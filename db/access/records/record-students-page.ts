import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import { studentScopeSql, type Caller } from "../shared/student-scope";
import type { ListedStudent } from "./student-list";

// The Records list, one page at a time: the students (active, with an active enrolment) whose
// record the caller may keep, filtered by cohort and by a part of the name, ordered by cohort then
// name, paged in SQL (LIMIT/OFFSET) with the number that match from one count; the cohorts to
// filter by from one grouped query. Three queries, whatever the size of the school.

export const RECORDS_PAGE_SIZE = 50;

export interface RecordStudentsFilter {
  cohortId?: string | undefined;
  /** a part of the student's name, any case */
  name?: string | undefined;
}

const FROM = `FROM people p
       JOIN active_enrolments e ON e.student_id = p.id
       LEFT JOIN cohort_memberships m ON m.student_id = p.id AND m.to_date IS NULL LEFT JOIN cohorts c ON c.id = m.cohort_id`;

function likePattern(part: string): string {
  return `%${part.replace(/[\\%_]/g, (ch) => `\\${ch}`)}%`;
}

export async function recordStudentsPage(
  caller: Caller,
  filter: RecordStudentsFilter = {},
  opts: { page?: number; pageSize?: number } = {},
): Promise<{ rows: ListedStudent[]; total: number; page: number; pageSize: number; cohorts: { id: string; name: string }[] }> {
  const scope = studentScopeSql(caller, "records", "p.id");
  const pageSize = opts.pageSize ?? RECORDS_PAGE_SIZE;
  const page = Math.max(1, Math.floor(opts.page ?? 1));
  const replacements = {
    schoolId: caller.schoolId,
    ...scope.replacements,
    cohortId: filter.cohortId ?? null,
    name: filter.name ? likePattern(filter.name) : null,
  };
  const where = `WHERE p.school_id = :schoolId AND p.active AND ${scope.sql}`;
  const matching = `${where}
        AND (CAST(:cohortId AS uuid) IS NULL OR m.cohort_id = CAST(:cohortId AS uuid))
        AND (CAST(:name AS text) IS NULL OR p.name ILIKE CAST(:name AS text))`;
  const [rows, [count], cohorts] = await Promise.all([
    sequelize.query<ListedStudent>(
      `SELECT p.id, p.name, c.name AS "cohortName" ${FROM} ${matching}
        ORDER BY c.name NULLS LAST, p.name, p.id LIMIT :limit OFFSET :offset`,
      { replacements: { ...replacements, limit: pageSize, offset: (page - 1) * pageSize }, type: QueryTypes.SELECT },
    ),
    sequelize.query<{ n: number }>(`SELECT count(*)::int AS n ${FROM} ${matching}`, { replacements, type: QueryTypes.SELECT }),
    sequelize.query<{ id: string; name: string }>(
      `SELECT c.id, c.name ${FROM} ${where} AND c.id IS NOT NULL GROUP BY c.id, c.name ORDER BY c.name`,
      { replacements, type: QueryTypes.SELECT },
    ),
  ]);
  return { rows, total: count?.n ?? 0, page, pageSize, cohorts };
}
