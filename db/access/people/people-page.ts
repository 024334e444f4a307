import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import type { Role } from "@/lib/auth/roles";
import type { PersonSummary } from "./person-summary";
import { containsPattern } from "../shared/like";

// The People page's "Everyone at the school", one page at a time: filtered by role and by a part
// of the name or e-mail, ordered by name, paged in SQL (LIMIT/OFFSET) with the number that match
// from one count. Two queries, whatever the size of the school.

export const PEOPLE_PAGE_SIZE = 50;

export async function peoplePage(
  schoolId: string,
  filter: { role?: Role | undefined; q?: string | undefined } = {},
  opts: { page?: number; pageSize?: number } = {},
): Promise<{ rows: PersonSummary[]; total: number; page: number; pageSize: number }> {
  const pageSize = opts.pageSize ?? PEOPLE_PAGE_SIZE;
  const page = Math.max(1, Math.floor(opts.page ?? 1));
  const replacements = { schoolId, role: filter.role ?? null, q: filter.q ? containsPattern(filter.q) : null };
  const where = `FROM people WHERE school_id = :schoolId
      AND (CAST(:role AS text) IS NULL OR CAST(:role AS text) = ANY(roles))
      AND (CAST(:q AS text) IS NULL OR name ILIKE CAST(:q AS text) OR email ILIKE CAST(:q AS text))`;
  const [rows, [count]] = await Promise.all([
    sequelize.query<PersonSummary>(`SELECT id, name, email, roles, active ${where} ORDER BY name, id LIMIT :limit OFFSET :offset`, {
      replacements: { ...replacements, limit: pageSize, offset: (page - 1) * pageSize },
      type: QueryTypes.SELECT,
    }),
    sequelize.query<{ n: number }>(`SELECT count(*)::int AS n ${where}`, { replacements, type: QueryTypes.SELECT }),
  ]);
  return { rows, total: count?.n ?? 0, page, pageSize };
}
