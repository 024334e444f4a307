import "server-only";
import PgBoss from "pg-boss";
import type { Transaction } from "@/db/access/mail/connection";
import { handOverDueMail } from "@/db/access/mail/queue-handover";
import { handOverWalks } from "@/db/access/records/audit-walks";
import { env } from "@/lib/env";
import type { MailConfig } from "./config";

export const MAIL_QUEUE = "mail.send";
export const BOSS_SCHEMA = "pgboss";

export interface MailJob {
  outboxId: string;
}

/** The full walk of a school's audit chain (migration 0720 made the queue): one job per walk. */
export const AUDIT_WALK_QUEUE = "audit.walk";
export const AUDIT_WALK_RETRY_LIMIT = 3;

export interface AuditWalkJob {
  walkId: string;
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
  await boss.createQueue(AUDIT_WALK_QUEUE, {
    name: AUDIT_WALK_QUEUE,
    policy: "standard",
    retryLimit: AUDIT_WALK_RETRY_LIMIT,
    retryDelay: 5,
    retryBackoff: true,
    expireInSeconds: 900,
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
  return handOverDueMail(at, { name: MAIL_QUEUE, schema: BOSS_SCHEMA }, async (outboxId, t) => {
    const jobId = await boss.send(MAIL_QUEUE, { outboxId } satisfies MailJob, {
      db: txDb(t),
      retryLimit: cfg.CHALKWING_MAIL_RETRY_LIMIT,
      retryDelay: cfg.CHALKWING_MAIL_RETRY_DELAY,
      retryBackoff: true,
      expireInSeconds: cfg.CHALKWING_MAIL_JOB_EXPIRE_SECONDS,
    });
    if (!jobId) throw new Error("queue refused the job");
    return jobId;
  });
}

/**
 * Hands the walks asked for on the chain page (queued or running, without a live job) to the
 * `audit.walk` queue, each job written with the walk's job id in one transaction.
 */
export async function moveWalksToQueue(boss: PgBoss): Promise<number> {
  return handOverWalks({ name: AUDIT_WALK_QUEUE, schema: BOSS_SCHEMA }, async (walkId, t) => {
    const jobId = await boss.send(AUDIT_WALK_QUEUE, { walkId } satisfies AuditWalkJob, {
      db: txDb(t),
      retryLimit: AUDIT_WALK_RETRY_LIMIT,
      retryDelay: 5,
      retryBackoff: true,
      expireInSeconds: 900,
    });
    if (!jobId) throw new Error("queue refused the walk");
    return jobId;
  });
}
