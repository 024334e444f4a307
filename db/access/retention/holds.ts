import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/can";
import { HttpError } from "@/lib/http/errors";
import { now } from "@/lib/clock";
import type { LiftHoldInput, SetHoldInput } from "@/lib/retention/schema";
import { writeAudit } from "../records/audit-chain";

// A legal hold keeps a student's record past its retention date until the chief lifts it; setting
// and lifting each carry a reason and are audit-chain events. A lifted hold stays on file.

async function requireStudentOfSchool(t: Transaction, schoolId: string, studentId: string) {
  const [p] = await sequelize.query<{ id: string }>(
    `SELECT id FROM people WHERE id = :id AND school_id = :school AND 'student' = ANY(roles)`,
    { replacements: { id: studentId, school: schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!p) throw new HttpError(404, "studentId: no such student", "studentId");
}

export async function setLegalHold(t: Transaction, user: CurrentUser, input: SetHoldInput): Promise<{ holdId: string }> {
  if (!can(user, "retention.manage")) throw new HttpError(403, "Only the chief instructor sets a legal hold");
  await requireStudentOfSchool(t, user.schoolId, input.studentId);
  await sequelize.query(`SELECT pg_advisory_xact_lock(hashtext(:k))`, { replacements: { k: `hold:${input.studentId}` }, transaction: t });
  const [open] = await sequelize.query<{ id: string }>(`SELECT id FROM retention_holds WHERE student_id = :s AND lifted_at IS NULL`, {
    replacements: { s: input.studentId },
    type: QueryTypes.SELECT,
    transaction: t,
  });
  if (open) throw new HttpError(409, "studentId: this record is already on legal hold", "studentId");
  const [row] = await sequelize.query<{ id: string }>(
    `INSERT INTO retention_holds (school_id, student_id, reason, set_by, set_at) VALUES (:school, :s, :reason, :by, :at) RETURNING id`,
    {
      replacements: { school: user.schoolId, s: input.studentId, reason: input.reason, by: user.id, at: now() },
      type: QueryTypes.SELECT,
      transaction: t,
    },
  );
  await writeAudit(t, {
    schoolId: user.schoolId,
    actor: user,
    action: "retention.hold",
    recordType: "retention_holds",
    recordId: row!.id,
    after: { studentId: input.studentId, reason: input.reason },
  });
  return { holdId: row!.id };
}

export async function liftLegalHold(t: Transaction, user: CurrentUser, input: LiftHoldInput): Promise<{ holdId: string }> {
  if (!can(user, "retention.manage")) throw new HttpError(403, "Only the chief instructor lifts a legal hold");
  const [hold] = await sequelize.query<{ id: string; studentId: string; reason: string; lifted: boolean }>(
    `SELECT id, student_id AS "studentId", reason, lifted_at IS NOT NULL AS lifted FROM retention_holds
      WHERE id = :id AND school_id = :school FOR UPDATE`,
    { replacements: { id: input.holdId, school: user.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!hold) throw new HttpError(404, "holdId: no such legal hold", "holdId");
  if (hold.lifted) throw new HttpError(409, "holdId: this legal hold was already lifted", "holdId");
  await sequelize.query(`UPDATE retention_holds SET lifted_by = :by, lifted_reason = :reason, lifted_at = :at WHERE id = :id`, {
    replacements: { id: hold.id, by: user.id, reason: input.reason, at: now() },
    transaction: t,
  });
  await writeAudit(t, {
    schoolId: user.schoolId,
    actor: user,
    action: "retention.hold_lifted",
    recordType: "retention_holds",
    recordId: hold.id,
    before: { studentId: hold.studentId, reason: hold.reason },
    after: { studentId: hold.studentId, liftedReason: input.reason },
  });
  return { holdId: hold.id };
}
