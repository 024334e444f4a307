import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { HttpError } from "@/lib/http/errors";
import type { CurrentUser } from "@/lib/auth/session";
import { letterLink } from "./letter-links";

// Preconditions of the chief's "send now": the pair exists at the school, the student agreed to
// the letter, the sponsor has not stopped it. The letter itself goes through the outbox under this
// week's key, so a double click, or the Friday run after it, writes one letter.

export async function sendableLetterLink(caller: Pick<CurrentUser, "schoolId">, sponsorId: string, studentId: string, t?: Transaction) {
  const link = await letterLink(caller.schoolId, sponsorId, studentId, t);
  if (!link.agreed)
    throw new HttpError(409, "studentId: the student has not agreed that this sponsor receives the Weekly letter", "studentId");
  if (link.stopped) throw new HttpError(409, "sponsorId: the sponsor stopped the Weekly letter about this student", "sponsorId");
  return link;
}

/** The outbox row of a week's letter for the pair, if written (state and when). */
export async function letterOfWeek(idempotencyKey: string, t?: Transaction) {
  const [row] = await sequelize.query<{ id: string; state: string; created_at: Date }>(
    `SELECT id, state, created_at FROM outbox WHERE idempotency_key = :k`,
    { replacements: { k: idempotencyKey }, type: QueryTypes.SELECT, transaction: t },
  );
  return row ?? null;
}
