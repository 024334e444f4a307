import "server-only";
import { createHash } from "node:crypto";
import type { Transaction } from "sequelize";
import { sequelize } from "../../index";
import { now } from "@/lib/clock";

export interface OutboxMail {
  schoolId: string;
  kind: string;
  /** Must include the revision of what the mail is about, e.g. `reschedule:<session>:<seq>:<person>`. */
  idempotencyKey: string;
  recipientId?: string | null;
  to: string;
  subject: string;
  text: string;
  html: string;
  headers?: Record<string, string>;
  dueAt?: Date;
}

export function messageIdFor(idempotencyKey: string): string {
  return `<${createHash("sha256").update(idempotencyKey).digest("hex").slice(0, 40)}@mail.chalkwing.test>`;
}

/**
 * Writes a mail into the outbox inside the caller's transaction: if the change that causes
 * the mail rolls back, so does the mail. A second write with the same key is ignored.
 * Returns true when a row was written.
 */
export async function enqueueMail(t: Transaction, mail: OutboxMail): Promise<boolean> {
  const [rows] = await sequelize.query(
    `INSERT INTO outbox (school_id, kind, idempotency_key, recipient_id, to_address, subject, body_text, body_html, headers, due_at, message_id)
     VALUES (:schoolId, :kind, :key, :recipientId, :to, :subject, :text, :html, :headers::jsonb, :dueAt, :messageId)
     ON CONFLICT (idempotency_key) DO NOTHING RETURNING id`,
    {
      transaction: t,
      replacements: {
        schoolId: mail.schoolId,
        kind: mail.kind,
        key: mail.idempotencyKey,
        recipientId: mail.recipientId ?? null,
        to: mail.to,
        subject: mail.subject,
        text: mail.text,
        html: mail.html,
        headers: JSON.stringify(mail.headers ?? {}),
        dueAt: mail.dueAt ?? now(),
        messageId: messageIdFor(mail.idempotencyKey),
      },
    },
  );
  return (rows as unknown[]).length > 0;
}
