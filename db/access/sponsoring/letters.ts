import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { HttpError } from "@/lib/http/errors";
import { writeAudit } from "../records/audit-chain";

// The Weekly letters sent to the caller (their history, newest first, each readable again as it
// was sent), and turning the letter back on after unsubscribing.

export interface SentLetter {
  id: string;
  subject: string;
  sentAt: Date;
  studentName: string;
}

const STUDENT_OF_KEY = `split_part(o.idempotency_key, ':', 3)`;

export async function lettersSentTo(caller: Pick<CurrentUser, "id" | "schoolId">): Promise<SentLetter[]> {
  return sequelize.query<SentLetter>(
    `SELECT o.id, o.subject, d.delivered_at AS "sentAt", coalesce(st.name, '') AS "studentName"
       FROM outbox o JOIN mail_deliveries d ON d.outbox_id = o.id
       LEFT JOIN people st ON st.id::text = ${STUDENT_OF_KEY}
      WHERE o.recipient_id = :me AND o.school_id = :school AND o.kind = 'weekly.letter' AND o.state = 'sent'
      ORDER BY d.delivered_at DESC, o.created_at DESC`,
    { replacements: { me: caller.id, school: caller.schoolId }, type: QueryTypes.SELECT },
  );
}

export interface SentLetterBody extends SentLetter {
  text: string;
}

/** One letter as sent, only to the person it was sent to (anyone else: 404). */
export async function letterSentTo(caller: Pick<CurrentUser, "id" | "schoolId">, letterId: string): Promise<SentLetterBody> {
  const notFound = new HttpError(404, "letterId: no such letter", "letterId");
  if (!/^[0-9a-f-]{36}$/i.test(letterId)) throw notFound;
  const [row] = await sequelize.query<SentLetterBody>(
    `SELECT o.id, o.subject, d.delivered_at AS "sentAt", coalesce(st.name, '') AS "studentName", o.body_text AS text
       FROM outbox o JOIN mail_deliveries d ON d.outbox_id = o.id
       LEFT JOIN people st ON st.id::text = ${STUDENT_OF_KEY}
      WHERE o.id = :id AND o.recipient_id = :me AND o.school_id = :school AND o.kind = 'weekly.letter' AND o.state = 'sent'`,
    { replacements: { id: letterId, me: caller.id, school: caller.schoolId }, type: QueryTypes.SELECT },
  );
  if (!row) throw notFound;
  return row;
}

/** The sponsor turns the Weekly letter about a student back on after unsubscribing (audited). */
export async function resubscribeLetter(
  caller: Pick<CurrentUser, "id" | "schoolId" | "roles">,
  studentId: string,
  t: Transaction,
): Promise<{ resumed: boolean }> {
  const [link] = await sequelize.query<{ id: string }>(
    `SELECT l.id FROM sponsor_links l JOIN people st ON st.id = l.student_id
      WHERE l.sponsor_id = :me AND l.student_id = :st AND st.school_id = :school`,
    { replacements: { me: caller.id, st: studentId, school: caller.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!link) throw new HttpError(404, "studentId: not a student you sponsor", "studentId");
  const removed = await sequelize.query<{ sponsor_id: string }>(
    `DELETE FROM mail_unsubscribes WHERE sponsor_id = :me AND student_id = :st AND kind = 'weekly.letter' RETURNING sponsor_id`,
    { replacements: { me: caller.id, st: studentId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (removed.length === 0) return { resumed: false };
  await writeAudit(t, {
    schoolId: caller.schoolId,
    actor: caller,
    action: "sponsor_link.letter_resumed",
    recordType: "sponsor_link",
    recordId: link.id,
    before: { unsubscribed: true },
    after: { unsubscribed: false },
  });
  return { resumed: true };
}
