import "server-only";
import type { Transporter } from "nodemailer";
import { OutboxRowBusy, recordFailedAttempt, sendOutboxRowOnce } from "@/db/access/mail/delivery";
import { env } from "@/lib/env";
import { now } from "@/lib/clock";
import { oneLine } from "./layout";

export type CrashPoint = "before-send" | "after-accept" | "after-commit";

/**
 * Test hook for the at-least-once proof: when the worker process runs with
 * CHALKWING_MAIL_CRASH_AT=<point>, it kills itself (SIGKILL, no clean-up) at that point.
 * Only a worker process started by `lib/mail/worker.ts` can crash; never the web server.
 */
function crashIfAsked(point: CrashPoint, idempotencyKey: string): void {
  if (process.env.CHALKWING_MAIL_WORKER_PROCESS !== "1") return;
  if (process.env.CHALKWING_MAIL_CRASH_AT !== point) return;
  // optional: crash only on the mails whose key starts with this (a test's own mail)
  const only = process.env.CHALKWING_MAIL_CRASH_KEY;
  if (only && !idempotencyKey.startsWith(only)) return;
  console.error(`[mail-worker] crashing at ${point} as asked`);
  process.kill(process.pid, "SIGKILL");
}

export type DeliveryOutcome = "sent" | "skipped";

/**
 * Sends one outbox mail, at least once:
 * 1. lock the outbox row (a second worker skips it and retries later);
 * 2. send it over SMTP with its deterministic Message-ID;
 * 3. mark it sent and write its one delivery row, in the same transaction as the lock.
 * A crash before 2 sends nothing and leaves the row queued; a crash between 2 and 3 rolls the
 * transaction back, so the mail is sent again later with the same Message-ID; a crash after 3
 * finds the row sent on retry and sends nothing.
 * On an SMTP failure the attempt and error are recorded; `final` marks the row failed.
 */
export async function deliverOutboxMail(outboxId: string, opts: { transport: Transporter; final: boolean }): Promise<DeliveryOutcome> {
  let outcome: { state: DeliveryOutcome; key: string };
  try {
    outcome = await sendOutboxRowOnce(outboxId, async (row) => {
      crashIfAsked("before-send", row.idempotencyKey);
      const senderName = oneLine(row.senderName?.trim() || row.schoolName);
      const info = await opts.transport.sendMail({
        from: { name: senderName, address: env().MAIL_FROM_ADDRESS },
        to: row.toAddress,
        subject: row.subject,
        text: row.bodyText,
        html: row.bodyHtml,
        messageId: row.messageId,
        date: now(),
        headers: { "Auto-Submitted": "auto-generated", ...row.headers },
      });
      crashIfAsked("after-accept", row.idempotencyKey);
      return { response: String(info.response ?? "") };
    });
  } catch (e) {
    if (!(e instanceof OutboxRowBusy)) await recordFailedAttempt(outboxId, e instanceof Error ? e.message : String(e), opts.final);
    throw e;
  }
  if (outcome.state === "sent") crashIfAsked("after-commit", outcome.key);
  return outcome.state;
}
