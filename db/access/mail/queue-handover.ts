import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";

// Handing due outbox rows over to the mail queue (pg-boss, driven by lib/mail/queue.ts): one job
// per row, written with its `mail_jobs` marker in one transaction.

/**
 * For each due outbox row (`due_at <= at`, still queued) without a live job, calls `enqueue` in the
 * transaction that also records the job id in `mail_jobs` (a row whose job ended without sending
 * it gets a new job). `queue` names the pg-boss queue and the schema it lives in. Returns how
 * many rows were handed over.
 */
export async function handOverDueMail(
  at: Date,
  queue: { name: string; schema: string },
  enqueue: (outboxId: string, t: Transaction) => Promise<string>,
): Promise<number> {
  if (!/^[a-z_][a-z0-9_]*$/.test(queue.schema)) throw new Error(`not a schema name: ${queue.schema}`);
  return sequelize.transaction(async (t) => {
    const rows = await sequelize.query<{ id: string }>(
      `SELECT o.id FROM outbox o LEFT JOIN mail_jobs m ON m.outbox_id = o.id
        WHERE o.state = 'queued' AND o.due_at <= :at
          AND (m.outbox_id IS NULL OR NOT EXISTS (
                SELECT 1 FROM ${queue.schema}.job j
                 WHERE j.name = :q AND j.id = m.job_id AND j.state IN ('created','retry','active')))
        ORDER BY o.due_at LIMIT 500
        FOR UPDATE OF o SKIP LOCKED`,
      { replacements: { at, q: queue.name }, type: QueryTypes.SELECT, transaction: t },
    );
    for (const r of rows) {
      const jobId = await enqueue(r.id, t);
      await sequelize.query(
        `INSERT INTO mail_jobs (outbox_id, job_id) VALUES (:o, :j)
         ON CONFLICT (outbox_id) DO UPDATE SET job_id = EXCLUDED.job_id, queued_at = now()`,
        { replacements: { o: r.id, j: jobId }, transaction: t },
      );
    }
    return rows.length;
  });
}
