import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { now } from "@/lib/clock";
import type { CurrentUser } from "@/lib/auth/session";
import type { VerifyRow } from "./audit-chain";

// The full walk of a school's audit chain (migration 0720): asked for on the chain page, handed
// to the pg-boss queue `audit.walk` by the background worker (lib/mail/worker.ts), walked there in
// batches by position range. Progress and result live in `audit_walks`, never in a process.

export type WalkState = "queued" | "running" | "ok" | "broken" | "failed";

export interface AuditWalk {
  id: string;
  state: WalkState;
  requestedAt: Date;
  requestedBy: string | null;
  startedAt: Date | null;
  finishedAt: Date | null;
  /** events checked so far (all of `total` when ok) */
  checked: number;
  /** the chain's head position when the walk was asked for */
  total: number;
  broken: { position: number; id: string | null; problem: string } | null;
  failure: string | null;
}

interface WalkRow {
  id: string;
  state: WalkState;
  requested_at: Date;
  requested_by_name: string | null;
  started_at: Date | null;
  finished_at: Date | null;
  checked: string;
  total: string;
  broken_pos: string | null;
  broken_id: string | null;
  problem: string | null;
  failure: string | null;
}

const WALK_COLUMNS = `w.id, w.state, w.requested_at, p.name AS requested_by_name, w.started_at, w.finished_at, w.checked, w.total,
  w.broken_pos, w.broken_id, w.problem, w.failure`;

function toWalk(r: WalkRow): AuditWalk {
  return {
    id: r.id,
    state: r.state,
    requestedAt: r.requested_at,
    requestedBy: r.requested_by_name,
    startedAt: r.started_at,
    finishedAt: r.finished_at,
    checked: Number(r.checked),
    total: Number(r.total),
    broken: r.broken_pos === null ? null : { position: Number(r.broken_pos), id: r.broken_id, problem: r.problem ?? "" },
    failure: r.failure,
  };
}

/** The school's newest walk (queued, running or ended), or null when none was ever asked for. One query. */
export async function latestWalk(schoolId: string, t?: Transaction): Promise<AuditWalk | null> {
  const [r] = await sequelize.query<WalkRow>(
    `SELECT ${WALK_COLUMNS} FROM audit_walks w LEFT JOIN people p ON p.id = w.requested_by
      WHERE w.school_id = :schoolId ORDER BY w.requested_at DESC, w.id DESC LIMIT 1`,
    { replacements: { schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  return r ? toWalk(r) : null;
}

/**
 * Asks for a full walk of the caller's school. While a walk of the school is queued or running,
 * that walk is returned (`started: false`) and nothing is written; two callers at the same moment
 * meet at the partial unique index `audit_walks_one_live`. The head is captured now: the walk
 * checks positions 1 to the newest (or the checkpoint's, should rows have gone missing since).
 */
export async function startWalk(t: Transaction, user: CurrentUser): Promise<{ walk: AuditWalk; started: boolean }> {
  const [made] = await sequelize.query<{ id: string }>(
    `INSERT INTO audit_walks (school_id, requested_by, requested_at, total, checkpoint_pos, checkpoint_hash)
     SELECT :schoolId, :userId, :at,
            GREATEST(COALESCE((SELECT max(chain_pos) FROM audit_events WHERE school_id = :schoolId), 0), COALESCE(c.chain_pos, 0)),
            c.chain_pos, c.head_hash
       FROM (SELECT 1) one LEFT JOIN audit_checkpoints c ON c.school_id = :schoolId
     ON CONFLICT (school_id) WHERE state IN ('queued', 'running') DO NOTHING
     RETURNING id`,
    { replacements: { schoolId: user.schoolId, userId: user.id, at: now() }, type: QueryTypes.SELECT, transaction: t },
  );
  const walk = await latestLive(user.schoolId, t);
  if (!walk) throw new Error("audit walk neither written nor found");
  return { walk, started: Boolean(made) && made!.id === walk.id };
}

async function latestLive(schoolId: string, t: Transaction): Promise<AuditWalk | null> {
  const [r] = await sequelize.query<WalkRow>(
    `SELECT ${WALK_COLUMNS} FROM audit_walks w LEFT JOIN people p ON p.id = w.requested_by
      WHERE w.school_id = :schoolId AND w.state IN ('queued', 'running')`,
    { replacements: { schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  return r ? toWalk(r) : null;
}

/**
 * For each queued or running walk without a live job (never handed over, or its job ended
 * without finishing it: the worker died and the retries ran out), calls `enqueue` in the
 * transaction that records the job id on the walk. `queue` names the pg-boss queue and its schema.
 */
export async function handOverWalks(
  queue: { name: string; schema: string },
  enqueue: (walkId: string, t: Transaction) => Promise<string>,
): Promise<number> {
  if (!/^[a-z_][a-z0-9_]*$/.test(queue.schema)) throw new Error(`not a schema name: ${queue.schema}`);
  return sequelize.transaction(async (t) => {
    const rows = await sequelize.query<{ id: string }>(
      `SELECT w.id FROM audit_walks w
        WHERE w.state IN ('queued', 'running')
          AND (w.job_id IS NULL OR NOT EXISTS (
                SELECT 1 FROM ${queue.schema}.job j WHERE j.name = :q AND j.id = w.job_id AND j.state IN ('created', 'retry', 'active')))
        ORDER BY w.requested_at LIMIT 50
        FOR UPDATE OF w SKIP LOCKED`,
      { replacements: { q: queue.name }, type: QueryTypes.SELECT, transaction: t },
    );
    for (const r of rows) {
      const jobId = await enqueue(r.id, t);
      await sequelize.query(`UPDATE audit_walks SET job_id = :j WHERE id = :id`, { replacements: { id: r.id, j: jobId }, transaction: t });
    }
    return rows.length;
  });
}

export interface WalkOptions {
  /** positions per batch (one call of audit_verify_range) */
  batchSize: number;
  /** called after each batch's progress is written (tests look at the table there) */
  afterBatch?: (checked: number) => Promise<void> | void;
}

/**
 * Walks the chain for a queued or running walk, from where it stands (`checked`, `checked_hash`)
 * to the head captured when it was asked for, `batchSize` positions at a time; writes the progress
 * after each batch and the result at the end. A range is by position, so every copy of a duplicated
 * position is in one batch; each batch starts at the last position verified (not the range's end),
 * so a position missing at a boundary is found by the next batch. The rows ending below the
 * captured head is a missing row. The walk passes the checkpoint's position and compares the hash
 * there with the one the checkpoint kept (a rewritten chain would otherwise walk clean). A walk that
 * ends ok moves the checkpoint up to its head when it stood lower (or was not set).
 * Returns the walk as it ended, or null when it is not queued or running (already ended).
 */
export async function runWalk(walkId: string, opts: WalkOptions): Promise<AuditWalk | null> {
  if (!Number.isInteger(opts.batchSize) || opts.batchSize < 1) throw new Error("batchSize: a whole number from 1");
  const [w] = await sequelize.query<{
    school_id: string;
    total: string;
    checked: string;
    checked_hash: string;
    checkpoint_pos: string | null;
    checkpoint_hash: string | null;
  }>(
    `UPDATE audit_walks SET state = 'running', started_at = COALESCE(started_at, :at), updated_at = :at
      WHERE id = :walkId AND state IN ('queued', 'running')
      RETURNING school_id, total, checked, checked_hash, checkpoint_pos, checkpoint_hash`,
    { replacements: { walkId, at: now() }, type: QueryTypes.SELECT },
  );
  if (!w) return null;
  const total = Number(w.total);
  const cpPos = w.checkpoint_pos === null ? null : Number(w.checkpoint_pos);
  let checked = Number(w.checked);
  let hash = w.checked_hash;
  let broken: { pos: number; seq: string | null; id: string | null; problem: string } | null = null;
  while (checked < total) {
    let to = Math.min(checked + opts.batchSize, total);
    if (cpPos !== null && checked < cpPos) to = Math.min(to, cpPos);
    const [r] = await sequelize.query<VerifyRow>(`SELECT * FROM audit_verify_range(:schoolId, :from, :hash, :to)`, {
      replacements: { schoolId: w.school_id, from: checked, hash, to },
      type: QueryTypes.SELECT,
    });
    if (!r) throw new Error("audit_verify_range returned nothing");
    if (!r.ok) {
      checked = Number(r.checked);
      hash = r.head_hash;
      broken = { pos: Number(r.broken_pos), seq: r.broken_seq, id: r.broken_id, problem: r.problem ?? "" };
      break;
    }
    const reached = Number(r.checked);
    if (reached < to) {
      // no row after `reached` at all, though the chain stood at `total` when the walk was asked for
      checked = reached;
      broken = {
        pos: reached + 1,
        seq: null,
        id: null,
        problem: `row at position ${reached + 1} is missing (the chain ends at ${reached}; it reached ${total} when the walk was asked for)`,
      };
      break;
    }
    checked = reached;
    hash = r.head_hash;
    if (cpPos !== null && checked === cpPos && w.checkpoint_hash !== null && hash !== w.checkpoint_hash) {
      broken = {
        pos: cpPos,
        seq: null,
        id: null,
        problem: `the chain up to position ${cpPos} no longer ends in the hash kept when it was last verified`,
      };
      break;
    }
    await sequelize.query(`UPDATE audit_walks SET checked = :checked, checked_hash = :hash, updated_at = :at WHERE id = :walkId`, {
      replacements: { walkId, checked, hash, at: now() },
    });
    await opts.afterBatch?.(checked);
  }
  await sequelize.query(
    `UPDATE audit_walks SET state = :state, checked = :checked, checked_hash = :hash, finished_at = :at, updated_at = :at,
            broken_pos = :pos, broken_seq = :seq, broken_id = :id, problem = :problem
      WHERE id = :walkId`,
    {
      replacements: {
        walkId,
        state: broken ? "broken" : "ok",
        checked,
        hash,
        at: now(),
        pos: broken?.pos ?? null,
        seq: broken?.seq ?? null,
        id: broken?.id ?? null,
        problem: broken?.problem ?? null,
      },
    },
  );
  if (!broken && checked > 0)
    // a walk that ended ok has verified up to its head: the checkpoint may stand there (never moves back)
    await sequelize.query(
      `INSERT INTO audit_checkpoints (school_id, chain_pos, head_hash, verified_at) VALUES (:schoolId, :pos, :hash, :at)
       ON CONFLICT (school_id) DO UPDATE SET chain_pos = EXCLUDED.chain_pos, head_hash = EXCLUDED.head_hash, verified_at = EXCLUDED.verified_at
        WHERE audit_checkpoints.chain_pos < EXCLUDED.chain_pos`,
      { replacements: { schoolId: w.school_id, pos: checked, hash, at: now() } },
    );
  return walkById(walkId);
}

/** The walk could not be carried out (the job's last retry failed): it ends as failed, with the reason. */
export async function failWalk(walkId: string, reason: string): Promise<void> {
  await sequelize.query(
    `UPDATE audit_walks SET state = 'failed', failure = :reason, finished_at = :at, updated_at = :at
      WHERE id = :walkId AND state IN ('queued', 'running')`,
    { replacements: { walkId, reason: reason.slice(0, 500), at: now() } },
  );
}

export async function walkById(walkId: string): Promise<AuditWalk | null> {
  const [r] = await sequelize.query<WalkRow>(
    `SELECT ${WALK_COLUMNS} FROM audit_walks w LEFT JOIN people p ON p.id = w.requested_by WHERE w.id = :walkId`,
    { replacements: { walkId }, type: QueryTypes.SELECT },
  );
  return r ? toWalk(r) : null;
}
