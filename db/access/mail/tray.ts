import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import { env } from "@/lib/env";
import { listMessages, readRaw, type SinkEntry } from "@/lib/mail/sink-store";

// The Mail tray: captured mail (the local sink) that belongs to the caller's school.

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
