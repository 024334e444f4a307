import "server-only";
import { QueryTypes } from "sequelize";
import type { Transporter } from "nodemailer";
import { sequelize } from "@/db/index";
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

interface OutboxRow {
  id: string;
  idempotency_key: string;
  state: string;
  to_address: string;
  subject: string;
  body_text: string;
  body_html: string;
  headers: Record<string, string>;
  message_id: string;
  attempts: number;
  school_name: string;
  sender_name: string | null;
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
    outcome = await sequelize.transaction(async (t) => {
      const [row] = await sequelize.query<OutboxRow>(
        `SELECT o.id, o.idempotency_key, o.state, o.to_address, o.subject, o.body_text, o.body_html, o.headers, o.message_id, o.attempts,
                s.name AS school_name, s.settings->>'mailSenderName' AS sender_name
           FROM outbox o JOIN schools s ON s.id = o.school_id
          WHERE o.id = :id FOR UPDATE OF o SKIP LOCKED`,
        { replacements: { id: outboxId }, type: QueryTypes.SELECT, transaction: t },
      );
      if (!row) {
        const [exists] = await sequelize.query<{ state: string }>(`SELECT state FROM outbox WHERE id = :id`, {
          replacements: { id: outboxId },
          type: QueryTypes.SELECT,
          transaction: t,
        });
        if (!exists) return { state: "skipped" as const, key: "" }; // gone: nothing to send
        throw new Error("outbox row is being sent by another worker"); // retried later
      }
      if (row.state !== "queued") return { state: "skipped" as const, key: row.idempotency_key };
      crashIfAsked("before-send", row.idempotency_key);
      const senderName = oneLine(row.sender_name?.trim() || row.school_name);
      const info = await opts.transport.sendMail({
        from: { name: senderName, address: env().MAIL_FROM_ADDRESS },
        to: row.to_address,
        subject: row.subject,
        text: row.body_text,
        html: row.body_html,
        messageId: row.message_id,
        date: now(),
        headers: { "Auto-Submitted": "auto-generated", ...row.headers },
      });
      crashIfAsked("after-accept", row.idempotency_key);
      await sequelize.query(`UPDATE outbox SET state = 'sent', sent_at = :at, attempts = attempts + 1, last_error = NULL WHERE id = :id`, {
        replacements: { id: row.id, at: now() },
        transaction: t,
      });
      await sequelize.query(
        `INSERT INTO mail_deliveries (outbox_id, message_id, smtp_response, attempts) VALUES (:id, :mid, :resp, :attempts)`,
        {
          replacements: { id: row.id, mid: row.message_id, resp: String(info.response ?? "").slice(0, 500), attempts: row.attempts + 1 },
          transaction: t,
        },
      );
      return { state: "sent" as const, key: row.idempotency_key };
    });
  } catch (e) {
    const message = e instanceof Error ? e.message : String(e);
    if (!message.startsWith("outbox row is being sent")) {
      await sequelize.query(
        `UPDATE outbox SET attempts = attempts + 1, last_error = :err, state = CASE WHEN :final THEN 'failed' ELSE state END
          WHERE id = :id AND state = 'queued'`,
        { replacements: { id: outboxId, err: message.slice(0, 1000), final: opts.final } },
      );
    }
    throw e;
  }
  if (outcome.state === "sent") crashIfAsked("after-commit", outcome.key);
  return outcome.state;
}
