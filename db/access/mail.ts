import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../index";
import { HttpError } from "@/lib/http/errors";
import { env } from "@/lib/env";
import { listMessages, readRaw, type SinkEntry } from "@/lib/mail/sink-store";
import { studentIdsVisibleTo } from "./cohorts";

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

// ------------------------------------------------------------------ Mail tray

export function mailTrayEnabled(): boolean {
  const e = env();
  return e.CHALKWING_MAIL_TRAY === "on" && !!e.MAIL_SINK_DIR;
}

/**
 * The sink's messages that belong to this school (matched by Message-ID against the school's
 * outbox), newest first. The sink itself holds every school's mail.
 */
export async function listTray(schoolId: string, limit = 100): Promise<(SinkEntry & { kind: string })[]> {
  const dir = env().MAIL_SINK_DIR;
  if (!dir) return [];
  const all = listMessages(dir);
  if (all.length === 0) return [];
  const ids = [...new Set(all.map((m) => m.messageId).filter(Boolean))];
  const rows = await sequelize.query<{ message_id: string; kind: string }>(
    `SELECT message_id, kind FROM outbox WHERE school_id = :s AND message_id = ANY(ARRAY[:ids]::text[])`,
    { replacements: { s: schoolId, ids: ids.length ? ids : [""] }, type: QueryTypes.SELECT },
  );
  const kinds = new Map(rows.map((r) => [r.message_id, r.kind]));
  return all
    .filter((m) => kinds.has(m.messageId))
    .slice(0, limit)
    .map((m) => ({ ...m, kind: kinds.get(m.messageId)! }));
}

export async function readTrayMessage(schoolId: string, id: string): Promise<{ entry: SinkEntry; raw: Buffer } | null> {
  const dir = env().MAIL_SINK_DIR;
  if (!dir) return null;
  const entry = listMessages(dir).find((m) => m.id === id);
  if (!entry) return null;
  const [own] = await sequelize.query<{ ok: number }>(`SELECT 1 AS ok FROM outbox WHERE school_id = :s AND message_id = :m LIMIT 1`, {
    replacements: { s: schoolId, m: entry.messageId },
    type: QueryTypes.SELECT,
  });
  if (!own) return null;
  const raw = readRaw(dir, id);
  return raw ? { entry, raw } : null;
}

// ------------------------------------------------------------------ notes for sponsors

export interface NoteStudent {
  id: string;
  name: string;
  sponsors: number;
}

/** Students the caller may write a sponsor note for: their cohorts' students (the chief: everyone) who have a sponsor. */
export async function studentsForNotes(user: { id: string; schoolId: string; roles: string[] }): Promise<NoteStudent[]> {
  const visible = await studentIdsVisibleTo(user);
  if (visible !== "all" && visible.length === 0) return [];
  return sequelize.query<NoteStudent>(
    `SELECT p.id, p.name, count(l.id)::int AS sponsors FROM people p JOIN sponsor_links l ON l.student_id = p.id
      WHERE p.school_id = :s AND p.active ${visible === "all" ? "" : "AND p.id = ANY(ARRAY[:ids]::uuid[])"}
      GROUP BY p.id, p.name ORDER BY p.name`,
    { replacements: { s: user.schoolId, ids: visible === "all" ? [] : visible }, type: QueryTypes.SELECT },
  );
}

export interface NoteRow {
  id: string;
  studentName: string;
  authorName: string;
  body: string;
  createdAt: Date;
}

export async function recentNotes(user: { id: string; schoolId: string; roles: string[] }, limit = 30): Promise<NoteRow[]> {
  const visible = await studentIdsVisibleTo(user);
  if (visible !== "all" && visible.length === 0) return [];
  return sequelize.query<NoteRow>(
    `SELECT n.id, st.name AS "studentName", a.name AS "authorName", n.body, n.created_at AS "createdAt"
       FROM sponsor_notes n JOIN people st ON st.id = n.student_id JOIN people a ON a.id = n.author_id
      WHERE n.school_id = :s ${visible === "all" ? "" : "AND n.student_id = ANY(ARRAY[:ids]::uuid[])"}
      ORDER BY n.created_at DESC LIMIT :limit`,
    { replacements: { s: user.schoolId, ids: visible === "all" ? [] : visible, limit }, type: QueryTypes.SELECT },
  );
}

export async function addSponsorNote(
  user: { id: string; schoolId: string; roles: string[] },
  input: { studentId: string; body: string },
  t: Transaction,
) {
  const allowed = await studentsForNotes(user);
  if (!allowed.some((s) => s.id === input.studentId)) {
    throw new HttpError(404, "studentId: not a student of your cohorts with a sponsor", "studentId");
  }
  const [row] = await sequelize.query<{ id: string }>(
    `INSERT INTO sponsor_notes (school_id, student_id, author_id, body) VALUES (:s, :st, :a, :b) RETURNING id`,
    { replacements: { s: user.schoolId, st: input.studentId, a: user.id, b: input.body.trim() }, type: QueryTypes.SELECT, transaction: t },
  );
  return { id: row!.id };
}
