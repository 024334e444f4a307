import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import { now } from "@/lib/clock";

// Sending one outbox mail at least once (lib/mail/deliver.ts holds the SMTP side): the row is
// locked, handed to the sender while still queued, and marked sent with its one delivery row in
// the same transaction as the lock.

export interface OutboxMailToSend {
  id: string;
  idempotencyKey: string;
  state: string;
  toAddress: string;
  subject: string;
  bodyText: string;
  bodyHtml: string;
  headers: Record<string, string>;
  messageId: string;
  attempts: number;
  schoolName: string;
  senderName: string | null;
}

/** Thrown when another worker holds the row's lock; the job is retried later. */
export class OutboxRowBusy extends Error {
  constructor() {
    super("outbox row is being sent by another worker");
  }
}

/**
 * Locks the row (skipping a row another worker holds: OutboxRowBusy), calls `send` when it is still
 * queued, then marks it sent and writes its delivery row before the lock is released. A row that is
 * gone or no longer queued is "skipped". An error from `send` rolls everything back.
 */
export async function sendOutboxRowOnce(
  outboxId: string,
  send: (row: OutboxMailToSend) => Promise<{ response: string }>,
): Promise<{ state: "sent" | "skipped"; key: string }> {
  return sequelize.transaction(async (t) => {
    const [row] = await sequelize.query<OutboxMailToSend>(
      `SELECT o.id, o.idempotency_key AS "idempotencyKey", o.state, o.to_address AS "toAddress", o.subject, o.body_text AS "bodyText",
              o.body_html AS "bodyHtml", o.headers, o.message_id AS "messageId", o.attempts,
              s.name AS "schoolName", s.settings->>'mailSenderName' AS "senderName"
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
      throw new OutboxRowBusy(); // retried later
    }
    if (row.state !== "queued") return { state: "skipped" as const, key: row.idempotencyKey };
    const info = await send(row);
    await sequelize.query(`UPDATE outbox SET state = 'sent', sent_at = :at, attempts = attempts + 1, last_error = NULL WHERE id = :id`, {
      replacements: { id: row.id, at: now() },
      transaction: t,
    });
    await sequelize.query(
      `INSERT INTO mail_deliveries (outbox_id, message_id, smtp_response, attempts) VALUES (:id, :mid, :resp, :attempts)`,
      {
        replacements: { id: row.id, mid: row.messageId, resp: info.response.slice(0, 500), attempts: row.attempts + 1 },
        transaction: t,
      },
    );
    return { state: "sent" as const, key: row.idempotencyKey };
  });
}

/** Records a failed attempt on a still-queued row; `final` marks it failed. */
export async function recordFailedAttempt(outboxId: string, message: string, final: boolean): Promise<void> {
  await sequelize.query(
    `UPDATE outbox SET attempts = attempts + 1, last_error = :err, state = CASE WHEN :final THEN 'failed' ELSE state END
      WHERE id = :id AND state = 'queued'`,
    { replacements: { id: outboxId, err: message.slice(0, 1000), final } },
  );
}
