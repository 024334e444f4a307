import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { HttpError } from "@/lib/http/errors";

// The school's outbox as the Mail pages show it, and sending a failed mail again.

export const OUTBOX_STATES = ["queued", "sent", "failed", "cancelled"] as const;
export type OutboxState = (typeof OUTBOX_STATES)[number];

export interface OutboxListRow {
  id: string;
  kind: string;
  to: string;
  subject: string;
  state: OutboxState;
  attempts: number;
  lastError: string | null;
  dueAt: Date;
  sentAt: Date | null;
  messageId: string;
}

/** The school's outbox, newest first; never another school's mail. */
export async function listOutbox(schoolId: string, opts: { state?: OutboxState; limit?: number } = {}): Promise<OutboxListRow[]> {
  return sequelize.query<OutboxListRow>(
    `SELECT id, kind, to_address AS "to", subject, state, attempts, last_error AS "lastError", due_at AS "dueAt", sent_at AS "sentAt", message_id AS "messageId"
       FROM outbox WHERE school_id = :s AND (:state::text IS NULL OR state = :state)
      ORDER BY created_at DESC, id LIMIT :limit`,
    { replacements: { s: schoolId, state: opts.state ?? null, limit: opts.limit ?? 200 }, type: QueryTypes.SELECT },
  );
}

export async function outboxCounts(schoolId: string): Promise<Record<OutboxState, number>> {
  const rows = await sequelize.query<{ state: OutboxState; n: number }>(
    `SELECT state, count(*)::int AS n FROM outbox WHERE school_id = :s GROUP BY state`,
    {
      replacements: { s: schoolId },
      type: QueryTypes.SELECT,
    },
  );
  const out = { queued: 0, sent: 0, failed: 0, cancelled: 0 };
  for (const r of rows) out[r.state] = r.n;
  return out;
}

/** Puts a failed mail back in the queue; the worker sends it on its next tick. */
export async function retryFailedMail(schoolId: string, outboxId: string, t: Transaction): Promise<{ state: "queued" }> {
  const [row] = await sequelize.query<{ state: string }>(`SELECT state FROM outbox WHERE id = :id AND school_id = :s FOR UPDATE`, {
    replacements: { id: outboxId, s: schoolId },
    type: QueryTypes.SELECT,
    transaction: t,
  });
  if (!row) throw new HttpError(404, "outboxId: no such mail", "outboxId");
  if (row.state !== "failed")
    throw new HttpError(409, `outboxId: only a failed mail can be sent again (this one is ${row.state})`, "outboxId");
  await sequelize.query(`UPDATE outbox SET state = 'queued', due_at = LEAST(due_at, now()) WHERE id = :id`, {
    replacements: { id: outboxId },
    transaction: t,
  });
  await sequelize.query(`DELETE FROM mail_jobs WHERE outbox_id = :id`, { replacements: { id: outboxId }, transaction: t });
  return { state: "queued" };
}
