import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/can";
import { HttpError } from "@/lib/http/errors";
import { now } from "@/lib/clock";
import { formatDay } from "@/lib/time";
import type { ArchiveInput } from "@/lib/retention/schema";
import { writeAudit } from "../records/audit-chain";
import { retentionOf } from "./records";

// Marking a record archived: an explicit, audited act of the chief on a record past its retention
// date and not on legal hold. The mark is a row of its own; no record is changed or deleted.

export async function archiveRecord(t: Transaction, user: CurrentUser, input: ArchiveInput): Promise<{ archivalId: string }> {
  if (!can(user, "retention.manage")) throw new HttpError(403, "Only the chief instructor archives records");
  await sequelize.query(`SELECT pg_advisory_xact_lock(hashtext(:k))`, { replacements: { k: `hold:${input.studentId}` }, transaction: t });
  const r = await retentionOf(user.schoolId, input.studentId, t);
  if (!r) throw new HttpError(404, "studentId: no such student", "studentId");
  if (r.state === "archived") throw new HttpError(409, "studentId: this record is already archived", "studentId");
  if (r.state === "in_training") throw new HttpError(422, "studentId: the student is still in training", "studentId");
  if (r.state === "held") throw new HttpError(422, "studentId: the record is on legal hold; lift the hold first", "studentId");
  if (r.state !== "due" || !r.keepUntil || !r.endedOn)
    throw new HttpError(422, `studentId: the record is kept until ${r.keepUntil ? formatDay(r.keepUntil) : "a rule applies"}`, "studentId");
  const [row] = await sequelize.query<{ id: string }>(`SELECT gen_random_uuid() AS id`, { type: QueryTypes.SELECT, transaction: t });
  const audit = await writeAudit(t, {
    schoolId: user.schoolId,
    actor: user,
    action: "retention.archive",
    recordType: "record_archivals",
    recordId: row!.id,
    after: { studentId: r.studentId, endedOn: r.endedOn, keepUntil: r.keepUntil, governing: r.governing },
  });
  await sequelize.query(
    `INSERT INTO record_archivals (id, school_id, student_id, ended_on, keep_until, archived_by, audit_hash, created_at)
     VALUES (:id, :school, :s, :ended, :keep, :by, :hash, :at)`,
    {
      replacements: {
        id: row!.id,
        school: user.schoolId,
        s: r.studentId,
        ended: r.endedOn,
        keep: r.keepUntil,
        by: user.id,
        hash: audit.hash,
        at: now(),
      },
      transaction: t,
    },
  );
  return { archivalId: row!.id };
}
