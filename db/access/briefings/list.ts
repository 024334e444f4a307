import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { briefingVisibilitySql } from "./visibility";

export type BriefingSort = "title" | "updated" | "minutes" | "revision";
export interface BriefingListQuery {
  q?: string;
  item?: string;
  sort: BriefingSort;
  dir: "asc" | "desc";
  page: number;
  pageSize: number;
}
export interface BriefingListRow {
  id: string;
  title: string;
  revisionNumber: number;
  itemCodes: string[];
  minutes: number;
  handouts: number;
  demos: number;
  updatedAt: Date;
  updatedByName: string;
}

const SORT_SQL: Record<BriefingSort, string> = {
  title: `lower(r.title)`,
  updated: `r.created_at`,
  minutes: `minutes`,
  revision: `r.number`,
};

/** One page of the briefings the caller may read, filtered and sorted on the server. */
export async function listBriefings(
  caller: CurrentUser,
  query: BriefingListQuery,
): Promise<{ rows: BriefingListRow[]; total: number; page: number; pageSize: number }> {
  const visible = briefingVisibilitySql(caller);
  const where = `b.school_id = :schoolId AND ${visible}
      AND (:q::text IS NULL OR r.title ILIKE :qLike OR r.objective ILIKE :qLike)
      AND (:item::text IS NULL OR EXISTS (SELECT 1 FROM briefing_revision_items ri JOIN syllabus_items si ON si.id = ri.syllabus_item_id
                                         WHERE ri.briefing_revision_id = r.id AND si.code ILIKE :itemLike))`;
  const replacements = {
    schoolId: caller.schoolId,
    viewer: caller.id,
    q: query.q ?? null,
    qLike: `%${(query.q ?? "").replace(/[\\%_]/g, (c) => `\\${c}`)}%`,
    item: query.item ?? null,
    itemLike: `${(query.item ?? "").replace(/[\\%_]/g, (c) => `\\${c}`)}%`,
    limit: query.pageSize,
    offset: (query.page - 1) * query.pageSize,
  };
  const [count] = await sequelize.query<{ n: number }>(
    `SELECT count(*)::int AS n FROM briefings b JOIN briefing_revisions r ON r.id = b.current_revision_id WHERE ${where}`,
    { replacements, type: QueryTypes.SELECT },
  );
  const dir = query.dir === "asc" ? "ASC" : "DESC";
  const rows = await sequelize.query<BriefingListRow>(
    `SELECT b.id, r.title, r.number AS "revisionNumber", r.created_at AS "updatedAt", p.name AS "updatedByName",
            COALESCE((SELECT sum((e->>'minutes')::int) FROM jsonb_array_elements(r.elements) e), 0)::int AS minutes,
            ARRAY(SELECT si.code FROM briefing_revision_items ri JOIN syllabus_items si ON si.id = ri.syllabus_item_id
                   WHERE ri.briefing_revision_id = r.id ORDER BY si.code) AS "itemCodes",
            (SELECT count(*)::int FROM briefing_revision_handouts h WHERE h.briefing_revision_id = r.id) AS handouts,
            (SELECT count(*)::int FROM briefing_revision_demos d WHERE d.briefing_revision_id = r.id) AS demos
       FROM briefings b JOIN briefing_revisions r ON r.id = b.current_revision_id JOIN people p ON p.id = r.created_by
      WHERE ${where}
      ORDER BY ${SORT_SQL[query.sort]} ${dir}, b.id
      LIMIT :limit OFFSET :offset`,
    { replacements, type: QueryTypes.SELECT },
  );
  return { rows, total: count?.n ?? 0, page: query.page, pageSize: query.pageSize };
}
