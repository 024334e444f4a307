// A direct PostgreSQL connection to the end-to-end database as the owner role (DATABASE_OWNER_URL,
// exported by lib/ops/test.sh), for fixtures and for "no rows changed" fingerprints.
import { Client } from "pg";

export async function ownerClient(): Promise<Client> {
  const url = process.env.DATABASE_OWNER_URL;
  if (!url) throw new Error("DATABASE_OWNER_URL is not set: run the e2e layer through `npm test -- --only e2e`");
  const c = new Client({ connectionString: url });
  await c.connect();
  return c;
}

/**
 * Tables left out of the fingerprint, each with its reason. Keep this list short: a table
 * here is no longer checked for "a refused call changed nothing".
 */
export const FINGERPRINT_EXCLUDE: Record<string, string> = {
  "public.schema_migrations": "written only by migrations",
  "public.mail_deliveries": "written by the mail worker in the background (delivery receipts of outbox rows)",
  "public.mail_jobs": "written by the mail worker in the background (queue bookkeeping of outbox rows)",
  "public.audit_checkpoints":
    "the verified position of the audit chain, moved forward when the chief's Today checks new events (a cache of the verification, not a record)",
  "public.summary_cache":
    "summaries computed from the records (stages waiting, watch notes, counts), kept when a page or GET /api/today reads one not kept yet (a cache of a read, not a record; migration 0650)",
};
/**
 * Tables fingerprinted by an expression over the row (alias x) instead of the whole row, where
 * background work legitimately changes some columns. New or removed rows are still seen.
 */
export const FINGERPRINT_ROW: Record<string, { expr: string; where?: string; reason: string }> = {
  "public.outbox": {
    expr: "(x.id, x.school_id, x.kind, x.idempotency_key, x.recipient_id, x.to_address, x.subject)",
    where: "x.kind NOT IN ('session.reminder', 'assignment.overdue', 'weekly.letter')",
    reason:
      "the mail worker updates state, attempts and sent_at, and its clock-driven producers add reminders, overdue reminders and Weekly letters",
  },
  "public.audit_walks": {
    expr: "(x.id, x.school_id, x.requested_by, x.requested_at, x.total, x.checkpoint_pos, x.checkpoint_hash)",
    reason: "the background worker writes a full walk's job id, progress and result after the chief asked for it (migration 0720)",
  },
};
/** Schemas left out: pg-boss keeps its job queue in its own schema, which a background worker changes. */
const SCHEMA_EXCLUDE = ["pg_catalog", "information_schema", "pg_toast", "pgboss"];

/** Per table: row count and an md5 of all rows in a stable order. */
export async function fingerprint(c: Client): Promise<Record<string, string>> {
  const { rows: tables } = await c.query<{ schema: string; name: string }>(
    `SELECT schemaname AS schema, tablename AS name FROM pg_tables
      WHERE schemaname <> ALL($1::text[]) AND schemaname NOT LIKE 'pg_temp%' ORDER BY 1, 2`,
    [SCHEMA_EXCLUDE],
  );
  const wanted = tables.filter((t) => !(`${t.schema}.${t.name}` in FINGERPRINT_EXCLUDE));
  if (wanted.length === 0) return {};
  const rowExpr = (t: { schema: string; name: string }) => FINGERPRINT_ROW[`${t.schema}.${t.name}`]?.expr ?? "x";
  const q = (s: string) => `"${s.replace(/"/g, '""')}"`;
  const sql = wanted
    .map(
      (t) =>
        `SELECT '${t.schema}.${t.name}' AS t, count(*)::text || ':' || coalesce(md5(string_agg(${rowExpr(t)}::text, '|' ORDER BY ${rowExpr(t)}::text)), '') AS fp FROM ${q(t.schema)}.${q(t.name)} x${FINGERPRINT_ROW[`${t.schema}.${t.name}`]?.where ? ` WHERE ${FINGERPRINT_ROW[`${t.schema}.${t.name}`]!.where}` : ""}`,
    )
    .join(" UNION ALL ");
  const { rows } = await c.query<{ t: string; fp: string }>(sql);
  return Object.fromEntries(rows.map((r) => [r.t, r.fp]));
}

/** The tables whose fingerprint differs between two snapshots. */
export function changedTables(before: Record<string, string>, after: Record<string, string>): string[] {
  const names = new Set([...Object.keys(before), ...Object.keys(after)]);
  return [...names].filter((n) => before[n] !== after[n]).sort();
}
