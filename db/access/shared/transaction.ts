import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";

// The unit of work every server action runs in, and its idempotency keys: a retried submit with
// the same key waits for the first (advisory lock) and then gets the first result back.

export type { Transaction };

/** Runs `work` in one database transaction (committed when it resolves, rolled back when it throws). */
export function withTransaction<T>(work: (t: Transaction) => Promise<T>): Promise<T> {
  return sequelize.transaction(work);
}

/** Serialises requests with the same key of the same person until `t` ends. */
export async function lockIdempotencyKey(t: Transaction, personId: string, key: string): Promise<void> {
  await sequelize.query(`SELECT pg_advisory_xact_lock(hashtext(:k))`, { replacements: { k: `${personId}:${key}` }, transaction: t });
}

/** The stored result of an earlier request with this key, and the action scope it was used for. */
export async function priorIdempotentResult<T>(
  t: Transaction,
  personId: string,
  key: string,
): Promise<{ result: { data: T }; scope: string } | null> {
  const [prior] = await sequelize.query<{ result: { data: T }; scope: string }>(
    `SELECT result, scope FROM idempotency_keys WHERE person_id = :p AND key = :k`,
    { replacements: { p: personId, k: key }, type: QueryTypes.SELECT, transaction: t },
  );
  return prior ?? null;
}

/** Stores the result of the first request with this key, in the same transaction as its work. */
export async function storeIdempotentResult(t: Transaction, personId: string, key: string, scope: string, data: unknown): Promise<void> {
  await sequelize.query(`INSERT INTO idempotency_keys (person_id, key, scope, result) VALUES (:p, :k, :s, :r::jsonb)`, {
    replacements: { p: personId, k: key, s: scope, r: JSON.stringify({ data: data ?? null }) },
    transaction: t,
  });
}

/** Whether the database answers (the health check). */
export async function databaseReachable(): Promise<boolean> {
  try {
    await sequelize.query("SELECT 1");
    return true;
  } catch {
    return false;
  }
}
