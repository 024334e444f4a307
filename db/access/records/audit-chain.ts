import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { now } from "@/lib/clock";
import type { CurrentUser } from "@/lib/auth/session";

/**
 * The append-only audit trail. Each row is linked into its school's hash chain by the
 * database itself (trigger `audit_events_chain`, under a per-school transaction lock):
 * hash = sha256(previous hash | canonical row text). Rows can only be inserted.
 */
export interface AuditInput {
  schoolId: string;
  actor: Pick<CurrentUser, "id" | "roles"> | null;
  action: string;
  recordType: string;
  recordId: string;
  before?: unknown;
  after?: unknown;
  occurredAt?: Date;
}

export async function writeAudit(t: Transaction, e: AuditInput): Promise<{ id: string; chainPos: number; hash: string }> {
  const [row] = await sequelize.query<{ id: string; chainPos: string; hash: string }>(
    `INSERT INTO audit_events (school_id, actor_id, actor_roles, action, record_type, record_id, before, after, occurred_at, chain_pos, prev_hash, hash, seq)
     VALUES (:schoolId, :actorId, :roles::text[], :action, :recordType, :recordId, :before::jsonb, :after::jsonb, :occurredAt, 0, '', '', 0)
     RETURNING id, chain_pos AS "chainPos", hash`,
    {
      transaction: t,
      type: QueryTypes.SELECT,
      replacements: {
        schoolId: e.schoolId,
        actorId: e.actor?.id ?? null,
        roles: `{${(e.actor?.roles ?? []).join(",")}}`,
        action: e.action,
        recordType: e.recordType,
        recordId: e.recordId,
        before: e.before === undefined ? null : JSON.stringify(e.before),
        after: e.after === undefined ? null : JSON.stringify(e.after),
        occurredAt: e.occurredAt ?? now(),
      },
    },
  );
  if (!row) throw new Error("audit event not written");
  return { id: row.id, chainPos: Number(row.chainPos), hash: row.hash };
}

export interface ChainVerification {
  ok: boolean;
  /** rows checked before the first broken link (all rows when ok) */
  checked: number;
  /** hash of the last good row (the head when ok) */
  headHash: string;
  broken: { position: number; seq: number; id: string; problem: string } | null;
}

/** A row of audit_verify, audit_verify_from and audit_verify_range (they answer the same columns). */
export interface VerifyRow {
  ok: boolean;
  checked: string;
  head_hash: string;
  broken_pos: string | null;
  broken_seq: string | null;
  broken_id: string | null;
  problem: string | null;
}

/** The first broken link a verification row names (null when the chain linked up). */
export function brokenOf(r: VerifyRow): ChainVerification["broken"] {
  return r.ok ? null : { position: Number(r.broken_pos), seq: Number(r.broken_seq), id: r.broken_id ?? "", problem: r.problem ?? "" };
}

/** Walks the school's chain in the database and reports the first broken link. */
export async function verifyChain(schoolId: string): Promise<ChainVerification> {
  const [r] = await sequelize.query<VerifyRow>(`SELECT * FROM audit_verify(:schoolId)`, {
    replacements: { schoolId },
    type: QueryTypes.SELECT,
  });
  if (!r) throw new Error("audit_verify returned nothing");
  return { ok: r.ok, checked: Number(r.checked), headHash: r.head_hash, broken: brokenOf(r) };
}

/** The newest row's hash and position: printed on every export. */
export async function chainHead(schoolId: string): Promise<{ hash: string; position: number; at: Date | null }> {
  const [r] = await sequelize.query<{ hash: string; chain_pos: string; occurred_at: Date }>(
    `SELECT hash, chain_pos, occurred_at FROM audit_events WHERE school_id = :schoolId ORDER BY chain_pos DESC LIMIT 1`,
    { replacements: { schoolId }, type: QueryTypes.SELECT },
  );
  return r ? { hash: r.hash, position: Number(r.chain_pos), at: r.occurred_at } : { hash: "0".repeat(64), position: 0, at: null };
}

export interface AuditRow {
  id: string;
  position: number;
  action: string;
  recordType: string;
  recordId: string;
  actorName: string | null;
  occurredAt: Date;
  hash: string;
}

export async function listAuditEvents(schoolId: string, opts: { recordId?: string; limit?: number } = {}): Promise<AuditRow[]> {
  return (
    await sequelize.query<AuditRow & { position: string }>(
      `SELECT e.id, e.chain_pos AS position, e.action, e.record_type AS "recordType", e.record_id AS "recordId",
              p.name AS "actorName", e.occurred_at AS "occurredAt", e.hash
         FROM audit_events e LEFT JOIN people p ON p.id = e.actor_id
        WHERE e.school_id = :schoolId AND (:recordId::uuid IS NULL OR e.record_id = :recordId::uuid)
        ORDER BY e.chain_pos DESC LIMIT :limit`,
      { replacements: { schoolId, recordId: opts.recordId ?? null, limit: opts.limit ?? 50 }, type: QueryTypes.SELECT },
    )
  ).map((r) => ({ ...r, position: Number(r.position) }));
}

/**
 * Verifies only the events written since the school's checkpoint (the last verified position and
 * head), then moves the checkpoint to where it got: five queries in one transaction, whatever the chain's length.
 * `since` is the checkpoint's position before this call and `sinceVerifiedAt` when it was set.
 * With `maxEvents`, at most that many positions after the checkpoint are walked (a page's GET stays
 * bounded even when no checkpoint was set yet, or a great many events came since); `unchecked` is
 * how many events after the checked position are left for the next call or a full walk.
 * A full walk from position 1 is the background walk (`audit-walks.ts`), the deliberate act on the
 * chain page; `verifyChain` walks it in one call (the inspection pack, tests).
 */
export async function verifyChainSinceCheckpoint(
  schoolId: string,
  opts: { maxEvents?: number } = {},
): Promise<ChainVerification & { since: number; sinceVerifiedAt: Date | null; unchecked: number; busy: boolean }> {
  const bounded = opts.maxEvents !== undefined;
  if (bounded && (!Number.isInteger(opts.maxEvents) || opts.maxEvents! < 1)) throw new Error("maxEvents: a whole number from 1");
  // One check at a time per school: visits that arrive while another checks the same events (many
  // chiefs' Today at once after a large import) answer from the checkpoint instead (`busy`), so
  // the database does not hash the same range once per visit.
  return sequelize.transaction(async (transaction) => {
    const [lock] = await sequelize.query<{ got: boolean }>(
      `SELECT pg_try_advisory_xact_lock(hashtextextended('audit-checkpoint:' || CAST(:schoolId AS text), 0)) AS got`,
      { replacements: { schoolId }, type: QueryTypes.SELECT, transaction },
    );
    const [cp] = await sequelize.query<{ chain_pos: string; head_hash: string; verified_at: Date }>(
      `SELECT chain_pos, head_hash, verified_at FROM audit_checkpoints WHERE school_id = :schoolId`,
      { replacements: { schoolId }, type: QueryTypes.SELECT, transaction },
    );
    const since = cp ? Number(cp.chain_pos) : 0;
    const hash = cp?.head_hash ?? "0".repeat(64);
    if (!lock?.got) {
      const [h] = await sequelize.query<{ head: string | null }>(
        `SELECT max(chain_pos) AS head FROM audit_events WHERE school_id = :schoolId`,
        {
          replacements: { schoolId },
          type: QueryTypes.SELECT,
          transaction,
        },
      );
      return {
        ok: true,
        checked: since,
        headHash: hash,
        since,
        sinceVerifiedAt: cp ? cp.verified_at : null,
        unchecked: Math.max(0, Number(h?.head ?? 0) - since),
        broken: null,
        busy: true,
      };
    }
    const [r] = await sequelize.query<VerifyRow & { head_pos: string | null }>(
      bounded
        ? `SELECT r.*, (SELECT max(chain_pos) FROM audit_events WHERE school_id = :schoolId) AS head_pos
             FROM audit_verify_range(:schoolId, :since, :hash, :to) r`
        : `SELECT *, NULL AS head_pos FROM audit_verify_from(:schoolId, :since, :hash)`,
      { replacements: { schoolId, since, hash, to: since + (opts.maxEvents ?? 0) }, type: QueryTypes.SELECT, transaction },
    );
    if (!r) throw new Error("audit_verify_from returned nothing");
    const checked = Number(r.checked);
    if (r.ok)
      await sequelize.query(
        `INSERT INTO audit_checkpoints (school_id, chain_pos, head_hash, verified_at) VALUES (:schoolId, :pos, :hash, :at)
         ON CONFLICT (school_id) DO UPDATE SET chain_pos = EXCLUDED.chain_pos, head_hash = EXCLUDED.head_hash, verified_at = EXCLUDED.verified_at
          WHERE audit_checkpoints.chain_pos <= EXCLUDED.chain_pos`,
        { replacements: { schoolId, pos: checked, hash: r.head_hash, at: now() }, transaction },
      );
    return {
      ok: r.ok,
      checked,
      headHash: r.head_hash,
      since,
      sinceVerifiedAt: cp ? cp.verified_at : null,
      unchecked: r.ok && r.head_pos !== null ? Math.max(0, Number(r.head_pos) - checked) : 0,
      broken: brokenOf(r),
      busy: false,
    };
  });
}
