import "server-only";
import { createHash } from "node:crypto";
import { QueryTypes, type Transaction } from "sequelize";
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
  /**
   * Change notices that come in bursts (a session moved twenty times in a minute) carry a key such
   * as `session.changed:<session>:<recipient>`: the new row replaces any unsent row with the same key
   * (marked cancelled, `superseded_by` the new row, never deleted) and waits `settleMs` (default
   * CHALKWING_MAIL_SETTLE_SECONDS, 60 s) so the worker sends one mail for the burst.
   * `facts` are kept on the row for the notice that may replace it (see `pendingNoticeFacts`).
   */
  coalesce?: { key: string; settleMs?: number; facts?: Record<string, unknown> };
}

/** The settle window for coalesced notices: CHALKWING_MAIL_SETTLE_SECONDS (0..3600, default 60). */
export function settleWindowMs(): number {
  const raw = process.env.CHALKWING_MAIL_SETTLE_SECONDS;
  if (raw === undefined || raw === "") return 60_000;
  const n = Number(raw);
  if (!Number.isFinite(n) || n < 0 || n > 3600) throw new Error("CHALKWING_MAIL_SETTLE_SECONDS: a number of seconds from 0 to 3600");
  return n * 1000;
}

/**
 * The facts kept on each still-unsent notice for these coalesce keys (e.g. the time the recipient
 * last heard of), locked until `t` ends so the notice that replaces it can carry them over.
 */
export async function pendingNoticeFacts(t: Transaction, keys: string[]): Promise<Map<string, Record<string, unknown>>> {
  if (keys.length === 0) return new Map();
  const rows = await sequelize.query<{ key: string; facts: Record<string, unknown> }>(
    `SELECT coalesce_key AS key, coalesce_facts AS facts FROM outbox
      WHERE coalesce_key IN (:keys) AND state = 'queued' FOR UPDATE`,
    { replacements: { keys }, type: QueryTypes.SELECT, transaction: t },
  );
  return new Map(rows.map((r) => [r.key, r.facts]));
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
  const c = mail.coalesce;
  let superseded: string[] = [];
  if (c) {
    const [seen] = await sequelize.query<{ id: string }>(`SELECT id FROM outbox WHERE idempotency_key = :key`, {
      replacements: { key: mail.idempotencyKey },
      type: QueryTypes.SELECT,
      transaction: t,
    });
    if (seen) return false;
    const old = await sequelize.query<{ id: string }>(
      `UPDATE outbox SET state = 'cancelled', last_error = 'replaced by a later notice about the same change'
        WHERE coalesce_key = :ck AND state = 'queued' RETURNING id`,
      { replacements: { ck: c.key }, type: QueryTypes.SELECT, transaction: t },
    );
    superseded = old.map((o) => o.id);
  }
  const [written] = await sequelize.query<{ id: string }>(
    `INSERT INTO outbox (school_id, kind, idempotency_key, recipient_id, to_address, subject, body_text, body_html, headers, due_at, message_id,
                         coalesce_key, coalesce_facts)
     VALUES (:schoolId, :kind, :key, :recipientId, :to, :subject, :text, :html, :headers::jsonb, :dueAt, :messageId, :ck, :facts::jsonb)
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
        dueAt: mail.dueAt ?? (c ? new Date(now().getTime() + (c.settleMs ?? settleWindowMs())) : now()),
        messageId: messageIdFor(mail.idempotencyKey),
        ck: c?.key ?? null,
        facts: JSON.stringify(c?.facts ?? {}),
      },
      type: QueryTypes.SELECT,
    },
  );
  if (written && superseded.length > 0)
    await sequelize.query(`UPDATE outbox SET superseded_by = :id WHERE id IN (:ids)`, {
      replacements: { id: written.id, ids: superseded },
      transaction: t,
    });
  return written !== undefined;
}
