import "server-only";
import PgBoss from "pg-boss";
import type { Transaction } from "sequelize";
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { env } from "@/lib/env";
import type { MailConfig } from "./config";

export const MAIL_QUEUE = "mail.send";
export const BOSS_SCHEMA = "pgboss";

export interface MailJob {
  outboxId: string;
}

/**
 * pg-boss as the app role: the schema and the queue were made by migration 0401 (owner role),
 * so the worker starts with `migrate: false` and never changes the schema. `createQueue` is
 * still called (v10 wants it before `send`); for an existing queue it changes nothing.
 */
export async function startBoss(cfg: MailConfig): Promise<PgBoss> {
  const boss = new PgBoss({
    connectionString: env().DATABASE_URL,
    schema: BOSS_SCHEMA,
    migrate: false,
    schedule: false,
    supervise: true,
    maintenanceIntervalSeconds: cfg.CHALKWING_MAIL_MAINTENANCE_SECONDS,
    application_name: "chalkwing-mail-worker",
    max: 4,
  });
  boss.on("error", (e) => console.error("[mail-worker] queue error:", e.message));
  await boss.start();
  await boss.createQueue(MAIL_QUEUE, {
    name: MAIL_QUEUE,
    policy: "standard",
    retryLimit: cfg.CHALKWING_MAIL_RETRY_LIMIT,
    retryDelay: cfg.CHALKWING_MAIL_RETRY_DELAY,
    retryBackoff: true,
    expireInSeconds: cfg.CHALKWING_MAIL_JOB_EXPIRE_SECONDS,
  });
  return boss;
}

/** pg-boss runs its INSERT on the transaction's own connection, so job and marker commit together. */
function txDb(t: Transaction) {
  const client = (t as unknown as { connection: { query: (text: string, values?: unknown[]) => Promise<{ rows: unknown[] }> } }).connection;
  return { executeSql: (text: string, values: unknown[]) => client.query(text, values) };
}

/**
 * Moves due outbox rows (`due_at <= at`, still queued) into the queue: one job per row, written
 * with its `mail_jobs` marker in one transaction. A row whose job ended without sending it
 * (e.g. its retries ran out while the row was re-queued by hand) gets a new job.
 * Returns how many rows were moved.
 */
export async function moveDueToQueue(boss: PgBoss, at: Date, cfg: MailConfig): Promise<number> {
  return sequelize.transaction(async (t) => {
    const rows = await sequelize.query<{ id: string }>(
      `SELECT o.id FROM outbox o LEFT JOIN mail_jobs m ON m.outbox_id = o.id
        WHERE o.state = 'queued' AND o.due_at <= :at
          AND (m.outbox_id IS NULL OR NOT EXISTS (
                SELECT 1 FROM ${BOSS_SCHEMA}.job j
                 WHERE j.name = :q AND j.id = m.job_id AND j.state IN ('created','retry','active')))
        ORDER BY o.due_at LIMIT 500
        FOR UPDATE OF o SKIP LOCKED`,
      { replacements: { at, q: MAIL_QUEUE }, type: QueryTypes.SELECT, transaction: t },
    );
    for (const r of rows) {
      const jobId = await boss.send(MAIL_QUEUE, { outboxId: r.id } satisfies MailJob, {
        db: txDb(t),
        retryLimit: cfg.CHALKWING_MAIL_RETRY_LIMIT,
        retryDelay: cfg.CHALKWING_MAIL_RETRY_DELAY,
        retryBackoff: true,
        expireInSeconds: cfg.CHALKWING_MAIL_JOB_EXPIRE_SECONDS,
      });
      if (!jobId) throw new Error("queue refused the job");
      await sequelize.query(
        `INSERT INTO mail_jobs (outbox_id, job_id) VALUES (:o, :j)
         ON CONFLICT (outbox_id) DO UPDATE SET job_id = EXCLUDED.job_id, queued_at = now()`,
        { replacements: { o: r.id, j: jobId }, transaction: t },
      );
    }
    return rows.length;
  });
}
