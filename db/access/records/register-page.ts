import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";

// Which sign-offs and stage checks make up one page of the Sign-off register: filtered and sorted
// in SQL (newest date first, then newest entry), paged with LIMIT/OFFSET, and the number that
// match from one aggregate query.

export interface RegisterSqlFilter {
  instructorId?: string | undefined;
  cohortId?: string | undefined;
  stageId?: string | undefined;
  from?: string | undefined;
  to?: string | undefined;
}

export interface RegisterRowRef {
  kind: "sign_off" | "stage_check";
  id: string;
  /** the date shown and the entry time (as text, to the microsecond): the keyset of the register's order */
  d: string;
  rec: string;
}

// One row per sign-off and stage check with what the filter and the order need; a stage check's
// date is its day in the school's time zone, as shown. For a page, each of the two parts is
// filtered, ordered and cut at offset + limit rows on its own before the two are merged, so the
// sign-offs are read newest first from their index (migration 0660) and a first page stops after
// 50 rows instead of sorting every sign-off of the school (100 ms at 50,000 sign-offs).
function matchingSql(opts: { keyset: boolean }): string {
  const filters = (student: string, signer: string, cohort: string, stage: string, d: string) => `
        AND (CAST(:studentId AS uuid) IS NULL OR ${student} = CAST(:studentId AS uuid))
        AND (CAST(:instructorId AS uuid) IS NULL OR ${signer} = CAST(:instructorId AS uuid))
        AND (CAST(:cohortId AS uuid) IS NULL OR ${cohort} = CAST(:cohortId AS uuid))
        AND (CAST(:stageId AS uuid) IS NULL OR ${stage} = CAST(:stageId AS uuid))
        AND (CAST(:from AS date) IS NULL OR ${d} >= CAST(:from AS date))
        AND (CAST(:to AS date) IS NULL OR ${d} <= CAST(:to AS date))`;
  const keyset = (d: string, rec: string, id: string) =>
    opts.keyset ? `AND (${d}, ${rec}, ${id}) < (CAST(:afterD AS date), CAST(:afterRec AS timestamptz), CAST(:afterId AS uuid))` : "";
  const checkDay = "(s.occurred_at AT TIME ZONE :tz)::date";
  return `
  (SELECT 'sign_off' AS kind, s.id, s.signed_on AS d, s.signed_at AS rec
     FROM sign_offs s JOIN syllabus_items i ON i.id = s.syllabus_item_id
     LEFT JOIN cohort_memberships m ON m.student_id = s.student_id AND m.to_date IS NULL
    WHERE s.school_id = :schoolId ${filters("s.student_id", "s.signer_id", "m.cohort_id", "i.stage_id", "s.signed_on")}
      ${keyset("s.signed_on", "s.signed_at", "s.id")}
    ORDER BY s.signed_on DESC, s.signed_at DESC, s.id DESC LIMIT :branchLimit)
  UNION ALL
  (SELECT 'stage_check', s.id, ${checkDay}, s.recorded_at
     FROM stage_checks s LEFT JOIN cohort_memberships m ON m.student_id = s.student_id AND m.to_date IS NULL
    WHERE s.school_id = :schoolId ${filters("s.student_id", "s.examiner_id", "m.cohort_id", "s.stage_id", checkDay)}
      ${keyset(checkDay, "s.recorded_at", "s.id")}
    ORDER BY 3 DESC, 4 DESC, 2 DESC LIMIT :branchLimit)`;
}

function replacementsOf(schoolId: string, timeZone: string, filter: RegisterSqlFilter, studentId: string | null) {
  return {
    schoolId,
    tz: timeZone,
    studentId,
    instructorId: filter.instructorId ?? null,
    cohortId: filter.cohortId ?? null,
    stageId: filter.stageId ?? null,
    from: filter.from ?? null,
    to: filter.to ?? null,
  };
}

/**
 * The rows of one page (`limit` null: every matching row), in the register's order: `offset` rows
 * skipped, or (for reading every row in batches) the rows after `after` in that order.
 */
export async function registerRowRefs(
  schoolId: string,
  timeZone: string,
  filter: RegisterSqlFilter,
  studentId: string | null,
  page: { limit: number | null; offset?: number; after?: RegisterRowRef | undefined },
): Promise<RegisterRowRef[]> {
  const after = page.after;
  const offset = page.offset ?? 0;
  const rows = await sequelize.query<RegisterRowRef>(
    `SELECT kind, id, to_char(d, 'YYYY-MM-DD') AS d, rec::text AS rec FROM (${matchingSql({ keyset: Boolean(after) })}) x
      ORDER BY x.d DESC, x.rec DESC, x.id DESC LIMIT :limit OFFSET :offset`,
    {
      replacements: {
        ...replacementsOf(schoolId, timeZone, filter, studentId),
        limit: page.limit,
        offset,
        branchLimit: page.limit === null ? null : offset + page.limit,
        afterD: after?.d ?? null,
        afterRec: after?.rec ?? null,
        afterId: after?.id ?? null,
      },
      type: QueryTypes.SELECT,
    },
  );
  return rows;
}

/** How many rows match the filter (one aggregate query). */
export async function registerRowCount(
  schoolId: string,
  timeZone: string,
  filter: RegisterSqlFilter,
  studentId: string | null,
): Promise<number> {
  const [row] = await sequelize.query<{ n: string }>(`SELECT count(*) AS n FROM (${matchingSql({ keyset: false })}) x`, {
    replacements: { ...replacementsOf(schoolId, timeZone, filter, studentId), branchLimit: null },
    type: QueryTypes.SELECT,
  });
  return Number(row?.n ?? 0);
}
