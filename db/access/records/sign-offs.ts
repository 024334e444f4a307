import "server-only";
import { createHash } from "node:crypto";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/can";
import { verifyPassword } from "@/lib/auth/password";
import { HttpError } from "@/lib/http/errors";
import { now } from "@/lib/clock";
import { composeMail } from "@/lib/mail/compose";
import { requireStudentFor } from "../shared/student-scope";
import { getSchool } from "../shared/school";
import { enqueueMail } from "../mail/outbox";
import { writeAudit } from "./audit-chain";
import { RecordRefusal } from "./refusals";
import { planSignOff, type SignOffInput, type SignOffPlan } from "./sign-off-plan";

// Signing off an item, withdrawing or amending a sign-off, and the current sign-off per item.

function signatureOf(fields: Record<string, string | number | null>): string {
  const canonical = JSON.stringify(
    Object.keys(fields)
      .sort()
      .map((k) => [k, fields[k]]),
  );
  return createHash("sha256").update(canonical).digest("hex");
}

/** The signer re-enters their password: a mismatch is a `wrong_password` refusal naming the field. */
export async function confirmPassword(user: CurrentUser, password: string, t?: Transaction) {
  const [row] = await sequelize.query<{ password_hash: string | null }>(`SELECT password_hash FROM people WHERE id = :id`, {
    replacements: { id: user.id },
    type: QueryTypes.SELECT,
    transaction: t,
  });
  if (!(await verifyPassword(password, row?.password_hash)))
    throw new RecordRefusal("wrong_password", "password: does not match your password", "password");
}

interface CurrentSignOff {
  id: string;
  generation: number;
  signer_id: string;
  withdrawn: boolean;
}
async function latestSignOff(studentId: string, itemId: string, t?: Transaction): Promise<CurrentSignOff | null> {
  const [r] = await sequelize.query<CurrentSignOff>(
    `SELECT s.id, s.generation, s.signer_id, EXISTS (SELECT 1 FROM sign_off_withdrawals w WHERE w.sign_off_id = s.id) AS withdrawn
       FROM sign_offs s WHERE s.student_id = :studentId AND s.syllabus_item_id = :itemId ORDER BY s.generation DESC LIMIT 1`,
    { replacements: { studentId, itemId }, type: QueryTypes.SELECT, transaction: t },
  );
  return r ?? null;
}

async function insertSignOff(
  t: Transaction,
  user: CurrentUser,
  plan: SignOffPlan,
  generation: number,
  amends: { id: string; reason: string } | null,
) {
  const signedAt = now();
  const fields = {
    statement: plan.statement,
    studentId: plan.student.id,
    itemId: plan.item.id,
    basisCheckId: plan.basis.id,
    signerId: user.id,
    signedOn: plan.signedOn,
    signedAt: signedAt.toISOString(),
    generation,
    amendsId: amends?.id ?? null,
  };
  const signatureHash = signatureOf(fields);
  const [row] = await sequelize.query<{ id: string }>(
    `INSERT INTO sign_offs (school_id, student_id, syllabus_item_id, enrolment_id, generation, basis_check_id, signer_id, statement, signed_on, signed_at, signature_hash, amends_id, amend_reason)
     VALUES (:schoolId, :studentId, :itemId, :enrolmentId, :generation, :basis, :signer, :statement, :signedOn, :signedAt, :hash, :amendsId, :reason)
     ON CONFLICT (student_id, syllabus_item_id, generation) DO NOTHING RETURNING id`,
    {
      transaction: t,
      type: QueryTypes.SELECT,
      replacements: {
        schoolId: user.schoolId,
        studentId: plan.student.id,
        itemId: plan.item.id,
        enrolmentId: plan.student.enrolmentId,
        generation,
        basis: plan.basis.id,
        signer: user.id,
        statement: plan.statement,
        signedOn: plan.signedOn,
        signedAt,
        hash: signatureHash,
        amendsId: amends?.id ?? null,
        reason: amends?.reason ?? null,
      },
    },
  );
  if (!row) throw new RecordRefusal("already_signed", `itemId: ${plan.item.code} is already signed off for this student`, "itemId");
  await writeAudit(t, {
    schoolId: user.schoolId,
    actor: user,
    action: amends ? "signoff.amended" : "signoff.signed",
    recordType: "sign_off",
    recordId: row.id,
    before: amends ? { signOffId: amends.id } : undefined,
    after: { ...fields, itemCode: plan.item.code, signatureHash, ...(amends ? { reason: amends.reason } : {}) },
    occurredAt: signedAt,
  });
  return { id: row.id, signatureHash, signedAt, generation };
}

/**
 * Signs off an item: checks the basis (refusing with the reason), the signer's password,
 * that no sign-off is current, writes the signed record, the audit event and the student's mail.
 */
export async function signOff(t: Transaction, user: CurrentUser, input: SignOffInput) {
  const plan = await planSignOff(user, input, t);
  const latest = await latestSignOff(plan.student.id, plan.item.id, t);
  if (latest && !latest.withdrawn)
    throw new RecordRefusal("already_signed", `itemId: ${plan.item.code} is already signed off for this student`, "itemId");
  await confirmPassword(user, input.password, t);
  const result = await insertSignOff(t, user, plan, (latest?.generation ?? 0) + 1, null);
  const school = await getSchool(user.schoolId, t);
  const mail = composeMail(
    "record.signed",
    { name: plan.student.name, itemCode: plan.item.code, itemTitle: plan.item.title, signerName: user.name, signedOn: plan.signedOn },
    { name: school.name, timeZone: school.timeZone, senderName: school.settings.mailSenderName },
  );
  await enqueueMail(t, {
    schoolId: user.schoolId,
    kind: "record.signed",
    idempotencyKey: `record.signed:${result.id}:${plan.student.id}`,
    recipientId: plan.student.id,
    to: plan.student.email,
    ...mail,
  });
  return { ...result, statement: plan.statement, itemCode: plan.item.code };
}

async function ownSignOff(t: Transaction, user: CurrentUser, signOffId: string) {
  const [s] = await sequelize.query<{
    id: string;
    student_id: string;
    syllabus_item_id: string;
    signer_id: string;
    generation: number;
    basis_check_id: string;
  }>(
    `SELECT id, student_id, syllabus_item_id, signer_id, generation, basis_check_id FROM sign_offs WHERE id = :id AND school_id = :schoolId`,
    { replacements: { id: signOffId, schoolId: user.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!s) throw new HttpError(404, "signOffId: no such sign-off", "signOffId");
  await requireStudentFor(user, s.student_id, "records", t);
  if (!can(user, "records.manage") && s.signer_id !== user.id)
    throw new HttpError(403, "signOffId: only the signer or the chief instructor may change a sign-off", "signOffId");
  const latest = await latestSignOff(s.student_id, s.syllabus_item_id, t);
  if (!latest || latest.id !== s.id || latest.withdrawn)
    throw new HttpError(409, "signOffId: this sign-off is no longer current", "signOffId");
  return s;
}

/**
 * Withdraws a current sign-off with a reason; the item can then be signed again. A correction of
 * the record is signed as the sign-off was: the withdrawer re-enters their password.
 */
export async function withdrawSignOff(t: Transaction, user: CurrentUser, input: { signOffId: string; reason: string; password: string }) {
  const s = await ownSignOff(t, user, input.signOffId);
  await confirmPassword(user, input.password, t);
  const at = now();
  const [row] = await sequelize.query<{ sign_off_id: string }>(
    `INSERT INTO sign_off_withdrawals (sign_off_id, withdrawn_by, reason, withdrawn_at) VALUES (:id, :by, :reason, :at) ON CONFLICT DO NOTHING RETURNING sign_off_id`,
    { replacements: { id: s.id, by: user.id, reason: input.reason.trim(), at }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!row) throw new HttpError(409, "signOffId: already withdrawn", "signOffId");
  await writeAudit(t, {
    schoolId: user.schoolId,
    actor: user,
    action: "signoff.withdrawn",
    recordType: "sign_off",
    recordId: s.id,
    before: { state: "current" },
    after: { state: "withdrawn", reason: input.reason.trim() },
    occurredAt: at,
  });
  return { signOffId: s.id };
}

/** Amends a current sign-off: a new signed record that refers to the original, with a reason. */
export async function amendSignOff(
  t: Transaction,
  user: CurrentUser,
  input: { signOffId: string; reason: string; basisCheckId?: string | undefined; signedOn?: string | undefined; password: string },
) {
  const s = await ownSignOff(t, user, input.signOffId);
  const plan = await planSignOff(
    user,
    { studentId: s.student_id, itemId: s.syllabus_item_id, basisCheckId: input.basisCheckId, signedOn: input.signedOn },
    t,
  );
  await confirmPassword(user, input.password, t);
  return insertSignOff(t, user, plan, s.generation + 1, { id: s.id, reason: input.reason.trim() });
}

/** The current sign-off per item of a student (derived: newest generation, not withdrawn). */
export async function currentSignOffs(studentId: string, t?: Transaction) {
  return sequelize
    .query<{ id: string; itemId: string; signerName: string; signedOn: string; signedAt: Date; generation: number }>(
      `SELECT DISTINCT ON (s.syllabus_item_id) s.id, s.syllabus_item_id AS "itemId", p.name AS "signerName", s.signed_on AS "signedOn", s.signed_at AS "signedAt", s.generation,
            EXISTS (SELECT 1 FROM sign_off_withdrawals w WHERE w.sign_off_id = s.id) AS withdrawn
       FROM sign_offs s JOIN people p ON p.id = s.signer_id
      WHERE s.student_id = :studentId
      ORDER BY s.syllabus_item_id, s.generation DESC`,
      { replacements: { studentId }, type: QueryTypes.SELECT, transaction: t },
    )
    .then((rows) => rows.filter((r) => !(r as unknown as { withdrawn: boolean }).withdrawn));
}
