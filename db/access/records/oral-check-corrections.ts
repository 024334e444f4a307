import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/can";
import { HttpError } from "@/lib/http/errors";
import { now } from "@/lib/clock";
import { requireStudentFor } from "../shared/student-scope";
import { writeAudit } from "./audit-chain";
import { recordOralCheck, type OralCheckInput } from "./record-oral-check";
import { confirmPassword } from "./sign-offs";

// Corrections around an oral check: amending or withdrawing it, and the student's acknowledgement of the debrief.

/**
 * Amends an oral check: a new check that refers to the original, with a reason; the original
 * stays visible, marked amended. Only the instructor who recorded it, or one who may manage
 * records, amends it, re-entering their password as for a sign-off.
 */
export async function amendOralCheck(
  t: Transaction,
  user: CurrentUser,
  input: OralCheckInput & { amends: { checkId: string; reason: string }; password: string },
) {
  const [c] = await sequelize.query<{ id: string; instructor_id: string }>(
    `SELECT id, instructor_id FROM oral_checks WHERE id = :id AND school_id = :schoolId AND student_id = :studentId`,
    {
      replacements: { id: input.amends.checkId, schoolId: user.schoolId, studentId: input.studentId },
      type: QueryTypes.SELECT,
      transaction: t,
    },
  );
  if (!c) throw new HttpError(404, "amends.checkId: no such check", "amends.checkId");
  await requireStudentFor(user, input.studentId, "records", t);
  if (!can(user, "records.manage") && c.instructor_id !== user.id)
    throw new HttpError(
      403,
      "amends.checkId: only the instructor who recorded the check, or the chief instructor, may amend it",
      "amends.checkId",
    );
  await confirmPassword(user, input.password, t);
  return recordOralCheck(t, user, input);
}

/**
 * Withdraws an oral check (it stays visible, marked withdrawn, with the reason). A correction of
 * the record, signed as a sign-off is: the withdrawer re-enters their password.
 */
export async function withdrawOralCheck(t: Transaction, user: CurrentUser, input: { checkId: string; reason: string; password: string }) {
  const [c] = await sequelize.query<{ id: string; student_id: string; instructor_id: string }>(
    `SELECT id, student_id, instructor_id FROM oral_checks WHERE id = :id AND school_id = :schoolId`,
    { replacements: { id: input.checkId, schoolId: user.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!c) throw new HttpError(404, "checkId: no such check", "checkId");
  await requireStudentFor(user, c.student_id, "records", t);
  if (!can(user, "records.manage") && c.instructor_id !== user.id)
    throw new HttpError(403, "checkId: only the instructor who recorded the check, or the chief instructor, may withdraw it", "checkId");
  await confirmPassword(user, input.password, t);
  const at = now();
  const [row] = await sequelize.query<{ check_id: string }>(
    `INSERT INTO oral_check_withdrawals (check_id, withdrawn_by, reason, withdrawn_at) VALUES (:id, :by, :reason, :at)
     ON CONFLICT (check_id) DO NOTHING RETURNING check_id`,
    { replacements: { id: c.id, by: user.id, reason: input.reason.trim(), at }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!row) throw new HttpError(409, "checkId: the check is already withdrawn", "checkId");
  await writeAudit(t, {
    schoolId: user.schoolId,
    actor: user,
    action: "check.withdrawn",
    recordType: "oral_check",
    recordId: c.id,
    before: { state: "in force" },
    after: { state: "withdrawn", reason: input.reason.trim() },
    occurredAt: at,
  });
  return { checkId: c.id };
}

/** The student acknowledges the debrief of their own check (an acknowledgement, not consent). */
export async function acknowledgeOralCheck(t: Transaction, user: CurrentUser, checkId: string) {
  const [c] = await sequelize.query<{ id: string }>(
    `SELECT id FROM oral_checks WHERE id = :id AND school_id = :schoolId AND student_id = :me`,
    { replacements: { id: checkId, schoolId: user.schoolId, me: user.id }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!c) throw new HttpError(404, "checkId: no such check", "checkId");
  const at = now();
  const [row] = await sequelize.query<{ check_id: string }>(
    `INSERT INTO oral_check_acknowledgements (check_id, student_id, acknowledged_at) VALUES (:id, :me, :at)
     ON CONFLICT (check_id) DO NOTHING RETURNING check_id`,
    { replacements: { id: c.id, me: user.id, at }, type: QueryTypes.SELECT, transaction: t },
  );
  if (row) {
    await writeAudit(t, {
      schoolId: user.schoolId,
      actor: user,
      action: "check.acknowledged",
      recordType: "oral_check",
      recordId: c.id,
      after: { acknowledgedAt: at.toISOString() },
      occurredAt: at,
    });
  }
  return { checkId: c.id, acknowledged: true, first: !!row };
}
