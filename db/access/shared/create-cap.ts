import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { HttpError } from "@/lib/http/errors";

// A cap on how fast one person creates things a loop could pile up (a script hammering "create
// session"): past the cap in the last minute, the create is refused with a 429 and a plain message.

const CAPPED = {
  sessions: { table: "training_sessions", creator: "created_by", words: "sessions" },
  assignments: { table: "assignments", creator: "assigned_by", words: "assignments" },
  demos: { table: "demos", creator: "owner_id", words: "demos" },
  briefings: { table: "briefings", creator: "owner_id", words: "briefings" },
} as const;

export type CappedCreate = keyof typeof CAPPED;

/** Creates allowed per person per minute: CHALKWING_CREATE_CAP_PER_MINUTE (1..10000, default 30). */
export function createCapPerMinute(): number {
  const raw = process.env.CHALKWING_CREATE_CAP_PER_MINUTE;
  if (raw === undefined || raw === "") return 30;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 1 || n > 10_000) throw new Error("CHALKWING_CREATE_CAP_PER_MINUTE: a whole number from 1 to 10000");
  return n;
}

/**
 * Call inside the create's transaction, before writing. Counts the caller's creates of this kind in
 * the last minute (one create that writes several rows, e.g. an assignment to five students, counts
 * once: rows are grouped by the transaction that inserted them) and throws a 429 past the cap.
 * Creates by the same person and kind are serialised until `t` ends, so parallel requests cannot
 * slip past the count together.
 */
export async function capCreates(t: Transaction, caller: { id: string }, what: CappedCreate): Promise<void> {
  const c = CAPPED[what];
  const limit = createCapPerMinute();
  await sequelize.query(`SELECT pg_advisory_xact_lock(hashtext(:k))`, {
    replacements: { k: `create-cap:${what}:${caller.id}` },
    transaction: t,
  });
  const [row] = await sequelize.query<{ n: number }>(
    `SELECT count(DISTINCT xmin::text)::int AS n FROM ${c.table}
      WHERE ${c.creator} = :p AND created_at > now() - interval '1 minute'`,
    { replacements: { p: caller.id }, type: QueryTypes.SELECT, transaction: t },
  );
  if ((row?.n ?? 0) >= limit)
    throw new HttpError(429, `You have created ${limit} ${c.words} in the last minute: wait a minute, then try again`);
}
