// The background worker, run beside the web server by the start command (`tsx lib/mail/worker.ts`
// with the react-server condition). Each tick: the producers write what is due by the clock
// (reminders, overdue reminders, Weekly letters) into the outbox, then due outbox rows move into
// the pg-boss queue; the queue's handler sends each over SMTP (retries with backoff).
// The same process walks the audit chain when a chief asks for a full walk: a shorter tick hands
// asked-for walks (audit_walks) to the `audit.walk` queue, whose handler walks in batches.
import type PgBoss from "pg-boss";
import { closeDatabase } from "@/db/access/mail/connection";
import { now } from "@/lib/clock";
import { mailConfig } from "./config";
import { deliverOutboxMail } from "./deliver";
import { failWalk, runWalk } from "@/db/access/records/audit-walks";
import { AUDIT_WALK_QUEUE, MAIL_QUEUE, moveDueToQueue, moveWalksToQueue, startBoss, type AuditWalkJob, type MailJob } from "./queue";
import { runDueWork } from "./producers";
import { smtpTransport } from "./transport";

process.env.CHALKWING_MAIL_WORKER_PROCESS = "1";

async function main() {
  const cfg = mailConfig();
  const transport = smtpTransport();
  const boss = await startBoss(cfg);
  let stopping = false;

  // CHALKWING_MAIL_CONCURRENCY pg-boss workers in this process, one job each: a failed send
  // retries only its own mail. A worker that has just sent a mail looks for the next at once
  // (notifyWorker skips its polling pause), so a burst drains as fast as SMTP takes it; an idle
  // worker, or one whose send failed, polls again after the interval.
  for (let i = 0; i < cfg.CHALKWING_MAIL_CONCURRENCY; i++) {
    let workerId = "";
    workerId = await boss.work<MailJob>(
      MAIL_QUEUE,
      { batchSize: 1, pollingIntervalSeconds: Math.max(0.5, Math.min(2, cfg.CHALKWING_MAIL_TICK_SECONDS)), includeMetadata: true },
      async (jobs: PgBoss.JobWithMetadata<MailJob>[]) => {
        for (const job of jobs) {
          const outcome = await deliverOutboxMail(job.data.outboxId, { transport, final: job.retryCount >= job.retryLimit });
          console.log(`[mail-worker] ${job.data.outboxId} ${outcome}`);
        }
        if (jobs.length > 0 && workerId) boss.notifyWorker(workerId);
      },
    );
  }

  // The audit chain's full walk: one job at a time; progress is written to audit_walks after each
  // batch, so a retried job (the worker died) goes on from the last batch.
  await boss.work<AuditWalkJob>(
    AUDIT_WALK_QUEUE,
    { batchSize: 1, pollingIntervalSeconds: 1, includeMetadata: true },
    async (jobs: PgBoss.JobWithMetadata<AuditWalkJob>[]) => {
      for (const job of jobs) {
        try {
          const walk = await runWalk(job.data.walkId, { batchSize: cfg.CHALKWING_WALK_BATCH });
          console.log(`[walk] ${job.data.walkId} ${walk ? `${walk.state}, ${walk.checked} of ${walk.total}` : "already ended"}`);
        } catch (e) {
          const reason = e instanceof Error ? e.message : String(e);
          console.error(`[walk] ${job.data.walkId} failed: ${reason}`);
          if (job.retryCount >= job.retryLimit) await failWalk(job.data.walkId, reason);
          throw e;
        }
      }
    },
  );
  let walkTicking = false;
  const walkTick = async () => {
    if (walkTicking || stopping) return;
    walkTicking = true;
    try {
      const moved = await moveWalksToQueue(boss);
      if (moved > 0) console.log(`[walk] queued ${moved} walk(s)`);
    } catch (e) {
      console.error("[walk] hand-over failed:", e instanceof Error ? e.message : e);
    } finally {
      walkTicking = false;
    }
  };
  await walkTick();
  const walkTimer = setInterval(() => void walkTick(), cfg.CHALKWING_WALK_TICK_SECONDS * 1000);

  let running = false;
  const tick = async () => {
    if (running || stopping) return;
    running = true;
    try {
      const at = now();
      if (cfg.CHALKWING_MAIL_PRODUCERS === "on") {
        const made = await runDueWork(at);
        if (made.total > 0) console.log(`[mail-worker] wrote ${made.total} mail(s): ${JSON.stringify(made)}`);
      }
      const moved = await moveDueToQueue(boss, at, cfg);
      if (moved > 0) console.log(`[mail-worker] queued ${moved} mail(s)`);
    } catch (e) {
      console.error("[mail-worker] tick failed:", e instanceof Error ? e.message : e);
    } finally {
      running = false;
    }
  };
  await tick();
  const timer = setInterval(() => void tick(), cfg.CHALKWING_MAIL_TICK_SECONDS * 1000);
  console.log(
    `[mail-worker] running: tick ${cfg.CHALKWING_MAIL_TICK_SECONDS}s, ${cfg.CHALKWING_MAIL_CONCURRENCY} at once, SMTP ${process.env.SMTP_HOST ?? "127.0.0.1"}:${process.env.SMTP_PORT ?? 2525}`,
  );

  const stop = async () => {
    if (stopping) return;
    stopping = true;
    clearInterval(timer);
    clearInterval(walkTimer);
    await boss.stop({ graceful: true, wait: true, timeout: 10_000 }).catch(() => undefined);
    transport.close();
    await closeDatabase().catch(() => undefined);
    process.exit(0);
  };
  process.on("SIGTERM", () => void stop());
  process.on("SIGINT", () => void stop());
}

main().catch((e) => {
  console.error("[mail-worker] could not start:", e instanceof Error ? e.message : e);
  process.exit(1);
});
