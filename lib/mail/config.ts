import { z } from "zod";

// The mail worker's own settings (the SMTP settings themselves are in lib/env.ts).
const schema = z.object({
  /** How often the worker runs the producers and moves due outbox rows into the queue. */
  CHALKWING_MAIL_TICK_SECONDS: z.coerce.number().min(0.5).max(3600).default(15),
  /** How many mails one worker process sends at once (each its own pg-boss worker polling the queue). */
  CHALKWING_MAIL_CONCURRENCY: z.coerce.number().int().min(1).max(16).default(4),
  /** pg-boss retry: first delay in seconds, doubled each time (with jitter), and how many retries. */
  CHALKWING_MAIL_RETRY_DELAY: z.coerce.number().int().min(1).max(3600).default(30),
  CHALKWING_MAIL_RETRY_LIMIT: z.coerce.number().int().min(0).max(50).default(8),
  /** A job still active after this long (its worker died) is retried. */
  CHALKWING_MAIL_JOB_EXPIRE_SECONDS: z.coerce.number().int().min(1).max(3600).default(120),
  CHALKWING_MAIL_MAINTENANCE_SECONDS: z.coerce.number().int().min(1).max(3600).default(30),
  /** off: only deliver (tests that look at delivery alone). */
  CHALKWING_MAIL_PRODUCERS: z.enum(["on", "off"]).default("on"),
  /** The audit chain's full walk (same worker process): positions per batch, and how often asked-for walks are handed to the queue. */
  CHALKWING_WALK_BATCH: z.coerce.number().int().min(1).max(1_000_000).default(5000),
  CHALKWING_WALK_TICK_SECONDS: z.coerce.number().min(0.5).max(3600).default(2),
  /** Test hook: the worker process kills itself at this point of a delivery. */
  CHALKWING_MAIL_CRASH_AT: z.enum(["before-send", "after-accept", "after-commit"]).optional(),
});

export type MailConfig = z.infer<typeof schema>;

export function mailConfig(): MailConfig {
  const r = schema.safeParse(process.env);
  if (!r.success) {
    const i = r.error.issues[0];
    throw new Error(`Invalid mail setting ${i?.path.join(".")}: ${i?.message}`);
  }
  return r.data;
}
