import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import { STUDENT_ROLES } from "@/lib/auth/account-roles";
import type { PersonSummary } from "./person-summary";
import { containsPattern } from "../shared/like";

// Accounts and roles' list of staff and sponsors (every account that is not a student's), one page
// at a time: a part of the name to narrow it, ordered by name, paged in SQL (LIMIT/OFFSET) with the
// number that match from one count. Two queries, whatever the size of the school.

export const ACCOUNTS_PAGE_SIZE = 50;

export async function accountsPage(
  schoolId: string,
  filter: { name?: string | undefined } = {},
  opts: { page?: number; pageSize?: number } = {},
): Promise<{ rows: PersonSummary[]; total: number; page: number; pageSize: number }> {
  const pageSize = opts.pageSize ?? ACCOUNTS_PAGE_SIZE;
  const page = Math.max(1, Math.floor(opts.page ?? 1));
  const replacements = { schoolId, studentRoles: STUDENT_ROLES, name: filter.name ? containsPattern(filter.name) : null };
  const where = `FROM people WHERE school_id = :schoolId AND NOT (roles && ARRAY[:studentRoles]::text[])
      AND (CAST(:name AS text) IS NULL OR name ILIKE CAST(:name AS text))`;
  const [rows, [count]] = await Promise.all([
    sequelize.query<PersonSummary>(`SELECT id, name, email, roles, active ${where} ORDER BY name, id LIMIT :limit OFFSET :offset`, {
      replacements: { ...replacements, limit: pageSize, offset: (page - 1) * pageSize },
      type: QueryTypes.SELECT,
    }),
    sequelize.query<{ n: number }>(`SELECT count(*)::int AS n ${where}`, { replacements, type: QueryTypes.SELECT }),
  ]);
  return { rows, total: count?.n ?? 0, page, pageSize };
}
