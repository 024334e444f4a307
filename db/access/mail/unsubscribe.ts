import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import { verifyUnsubscribe, type UnsubscribeClaim } from "@/lib/mail/unsubscribe-token";

export interface UnsubscribeView {
  claim: UnsubscribeClaim;
  studentFirstName: string;
  already: boolean;
}

const KIND_LABEL: Record<UnsubscribeClaim["kind"], string> = { "weekly.letter": "the Weekly letter" };
export function unsubscribeKindLabel(kind: UnsubscribeClaim["kind"]): string {
  return KIND_LABEL[kind];
}

/**
 * What an unsubscribe link is about, for the confirmation page (reads only). Null for a forged,
 * altered or swapped token, or when the sponsor is no longer linked to the student.
 * The page shows the student's first name only: the link may be forwarded.
 */
export async function inspectUnsubscribe(token: string): Promise<UnsubscribeView | null> {
  const claim = verifyUnsubscribe(token);
  if (!claim) return null;
  const [row] = await sequelize.query<{ name: string; already: boolean }>(
    `SELECT st.name,
            EXISTS (SELECT 1 FROM mail_unsubscribes u WHERE u.sponsor_id = l.sponsor_id AND u.student_id = l.student_id AND u.kind = :kind) AS already
       FROM sponsor_links l JOIN people st ON st.id = l.student_id
      WHERE l.sponsor_id = :sp AND l.student_id = :st`,
    { replacements: { sp: claim.sponsorId, st: claim.studentId, kind: claim.kind }, type: QueryTypes.SELECT },
  );
  if (!row) return null;
  return { claim, studentFirstName: row.name.split(/\s+/)[0] ?? row.name, already: row.already };
}

/** Ends that kind of mail for that sponsor and student. Idempotent; false for a token that is not genuine. */
export async function applyUnsubscribe(token: string): Promise<boolean> {
  const claim = verifyUnsubscribe(token);
  if (!claim) return false;
  return sequelize.transaction(async (t) => {
    const [link] = await sequelize.query<{ id: string }>(`SELECT id FROM sponsor_links WHERE sponsor_id = :sp AND student_id = :st`, {
      replacements: { sp: claim.sponsorId, st: claim.studentId },
      type: QueryTypes.SELECT,
      transaction: t,
    });
    if (!link) return false;
    await sequelize.query(`INSERT INTO mail_unsubscribes (sponsor_id, student_id, kind) VALUES (:sp, :st, :kind) ON CONFLICT DO NOTHING`, {
      replacements: { sp: claim.sponsorId, st: claim.studentId, kind: claim.kind },
      transaction: t,
    });
    // a letter written but not yet sent is not sent either
    await sequelize.query(
      `UPDATE outbox SET state = 'cancelled', last_error = 'the sponsor stopped this mail' WHERE state = 'queued' AND kind = :kind AND idempotency_key LIKE :prefix`,
      { replacements: { kind: claim.kind, prefix: `${claim.kind}:${claim.sponsorId}:${claim.studentId}:%` }, transaction: t },
    );
    return true;
  });
}
