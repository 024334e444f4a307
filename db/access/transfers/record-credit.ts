import "server-only";
import { createHash, randomUUID } from "node:crypto";
import { QueryTypes, type Transaction } from "sequelize";
import { inTransaction, sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/can";
import { HttpError } from "@/lib/http/errors";
import { now } from "@/lib/clock";
import { dateInZone } from "@/lib/time";
import { checkTransferCredit } from "@/lib/transfers/cap";
import type { TransferCreditInput } from "@/lib/transfers/schema";
import { requireStudentFor } from "../shared/student-scope";
import { getSchool } from "../shared/school";
import { itemsOfRevision } from "../records/items";
import { writeAudit } from "../records/audit-chain";

// Recording a transfer credit: ground time and items from an earlier school, with the evidence
// and this school's test. Capped by 14 CFR 141.77(c) (lib/transfers/cap.ts), append-only, in the
// audit chain; a refused credit writes nothing.

export type EvidenceType = "application/pdf" | "image/png" | "image/jpeg";
export interface EvidenceFile {
  fileName: string;
  contentType: EvidenceType;
  bytes: Buffer;
}

export async function recordTransferCredit(
  t: Transaction,
  user: CurrentUser,
  input: TransferCreditInput,
  file: EvidenceFile,
): Promise<{ creditId: string; capMinutes: number; replayed: boolean }> {
  if (!can(user, "transfers.manage")) throw new HttpError(403, "Only the chief instructor records transfer credit");
  if (input.idempotencyKey) {
    // a retried upload of the same form returns the first credit instead of writing a second
    await sequelize.query(`SELECT pg_advisory_xact_lock(hashtext(:k))`, {
      replacements: { k: `transfer:${user.id}:${input.idempotencyKey}` },
      transaction: t,
    });
    const [prior] = await sequelize.query<{ id: string; cap: number }>(
      `SELECT id, cap_minutes AS cap FROM transfer_credits WHERE recorded_by = :by AND idempotency_key = :k`,
      { replacements: { by: user.id, k: input.idempotencyKey }, type: QueryTypes.SELECT, transaction: t },
    );
    if (prior) return { creditId: prior.id, capMinutes: prior.cap, replayed: true };
  }
  const { student } = await requireStudentFor(user, input.studentId, "records", t);
  const school = await getSchool(user.schoolId, t);
  if (input.testTakenOn > dateInZone(now(), school.timeZone))
    throw new HttpError(400, "testTakenOn: the test's date cannot be after today", "testTakenOn");
  // one credit at a time per student, so two credits cannot both fit under the cap
  await sequelize.query(`SELECT pg_advisory_xact_lock(hashtext(:k))`, {
    replacements: { k: `transfer-cap:${student.id}` },
    transaction: t,
  });
  const [prior] = await sequelize.query<{ approved: number; other: number }>(
    `SELECT COALESCE(sum(credited_minutes) FILTER (WHERE source_approved), 0)::int AS approved,
            COALESCE(sum(credited_minutes) FILTER (WHERE NOT source_approved), 0)::int AS other
       FROM transfer_credits WHERE student_id = :s AND course_id = :c`,
    { replacements: { s: student.id, c: student.courseId }, type: QueryTypes.SELECT, transaction: t },
  );
  const approved = input.sourceApproved === "yes";
  const cap = checkTransferCredit(
    student.minGroundMinutes,
    { approvedMinutes: prior?.approved ?? 0, notApprovedMinutes: prior?.other ?? 0 },
    { approved, minutes: input.creditedMinutes },
  );
  if (!cap.ok) throw new HttpError(422, cap.message, "creditedMinutes");

  const items = await itemsOfRevision(student.revisionId, t);
  const byId = new Map(items.map((i) => [i.id, i]));
  const itemIds = [...new Set(input.itemIds)];
  const unknown = itemIds.filter((id) => !byId.has(id));
  if (unknown.length > 0) throw new HttpError(400, "itemIds: not an item of the student's syllabus", "itemIds");
  if (itemIds.length > 0) {
    const already = await sequelize.query<{ id: string }>(
      `SELECT DISTINCT ci.syllabus_item_id AS id FROM transfer_credit_items ci JOIN transfer_credits c ON c.id = ci.credit_id
        WHERE c.student_id = :s AND ci.syllabus_item_id IN (:ids)`,
      { replacements: { s: student.id, ids: itemIds }, type: QueryTypes.SELECT, transaction: t },
    );
    if (already.length > 0)
      throw new HttpError(
        422,
        `itemIds: already credited by transfer: ${already.map((r) => byId.get(r.id)?.code ?? r.id).join(", ")}`,
        "itemIds",
      );
  }
  if (input.creditedMinutes === 0 && itemIds.length === 0)
    throw new HttpError(400, "creditedMinutes: credit some ground time or at least one item", "creditedMinutes");

  const id = randomUUID();
  const sha256 = createHash("sha256").update(file.bytes).digest("hex");
  const record = {
    studentId: student.id,
    courseId: student.courseId,
    enrolmentId: student.enrolmentId,
    sourceSchool: input.sourceSchool,
    sourceApproved: approved,
    creditedMinutes: input.creditedMinutes,
    capMinutes: cap.capMinutes,
    itemCodes: itemIds.map((i) => byId.get(i)!.code),
    testKind: input.testKind,
    testTakenOn: input.testTakenOn,
    testResult: input.testResult,
    note: input.note,
    evidence: { fileName: file.fileName, contentType: file.contentType, byteSize: file.bytes.length, sha256 },
  };
  const audit = await writeAudit(t, {
    schoolId: user.schoolId,
    actor: user,
    action: "transfer.credit",
    recordType: "transfer_credits",
    recordId: id,
    after: record,
  });
  await sequelize.query(
    `INSERT INTO transfer_credits (id, school_id, student_id, course_id, enrolment_id, source_school, source_approved, credited_minutes,
       cap_minutes, test_kind, test_taken_on, test_result, note, evidence_file_name, evidence_content_type, evidence_byte_size,
       evidence_sha256, evidence, recorded_by, idempotency_key, audit_hash, created_at)
     VALUES (:id, :school, :student, :course, :enrolment, :source, :approved, :minutes, :cap, :testKind, :testOn, :testResult, :note,
       :fileName, :contentType, :size, :sha, :bytes, :by, :key, :hash, :at)`,
    {
      replacements: {
        id,
        school: user.schoolId,
        student: student.id,
        course: student.courseId,
        enrolment: student.enrolmentId,
        source: input.sourceSchool,
        approved,
        minutes: input.creditedMinutes,
        cap: cap.capMinutes,
        testKind: input.testKind,
        testOn: input.testTakenOn,
        testResult: input.testResult,
        note: input.note,
        fileName: file.fileName,
        contentType: file.contentType,
        size: file.bytes.length,
        sha: sha256,
        bytes: file.bytes,
        by: user.id,
        key: input.idempotencyKey ?? null,
        hash: audit.hash,
        at: now(),
      },
      transaction: t,
    },
  );
  for (const itemId of itemIds)
    await sequelize.query(`INSERT INTO transfer_credit_items (credit_id, syllabus_item_id) VALUES (:id, :item)`, {
      replacements: { id, item: itemId },
      transaction: t,
    });
  return { creditId: id, capMinutes: cap.capMinutes, replayed: false };
}

/** `recordTransferCredit` in a transaction of its own (the upload route's one write). */
export async function saveTransferCredit(user: CurrentUser, input: TransferCreditInput, file: EvidenceFile) {
  return inTransaction((t) => recordTransferCredit(t, user, input, file));
}
