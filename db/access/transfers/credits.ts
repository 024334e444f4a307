import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/can";
import { HttpError } from "@/lib/http/errors";
import { containsPattern } from "../shared/like";

// Reading transfer credits (cross-area contract): the credits of one student on a course, the
// minutes they add to the ground hours, the items they credit, and the school's list for the chief.

export interface TransferCredit {
  id: string;
  studentId: string;
  studentName: string;
  courseId: string;
  sourceSchool: string;
  sourceApproved: boolean;
  creditedMinutes: number;
  capMinutes: number;
  testKind: "knowledge" | "proficiency" | "both";
  testTakenOn: string;
  testResult: string;
  note: string;
  evidenceFileName: string;
  evidenceContentType: string;
  evidenceByteSize: number;
  evidenceSha256: string;
  recordedByName: string;
  createdAt: Date;
  auditHash: string;
  items: { id: string; code: string; title: string }[];
}

const SELECT = `SELECT c.id, c.student_id AS "studentId", sp.name AS "studentName", c.course_id AS "courseId", c.source_school AS "sourceSchool",
         c.source_approved AS "sourceApproved", c.credited_minutes AS "creditedMinutes", c.cap_minutes AS "capMinutes",
         c.test_kind AS "testKind", to_char(c.test_taken_on, 'YYYY-MM-DD') AS "testTakenOn", c.test_result AS "testResult", c.note,
         c.evidence_file_name AS "evidenceFileName", c.evidence_content_type AS "evidenceContentType",
         c.evidence_byte_size AS "evidenceByteSize", c.evidence_sha256 AS "evidenceSha256", rp.name AS "recordedByName",
         c.created_at AS "createdAt", c.audit_hash AS "auditHash",
         COALESCE((SELECT json_agg(json_build_object('id', i.id, 'code', i.code, 'title', i.title) ORDER BY i.code)
                     FROM transfer_credit_items ci JOIN syllabus_items i ON i.id = ci.syllabus_item_id WHERE ci.credit_id = c.id), '[]') AS items
    FROM transfer_credits c JOIN people sp ON sp.id = c.student_id JOIN people rp ON rp.id = c.recorded_by`;

/**
 * The transfer credits of a student on a course, oldest first. No permission check: the caller has
 * already been given the student (requireStudentFor / recordStudentFor).
 */
export async function transferCreditsOf(studentId: string, courseId: string, t?: Transaction): Promise<TransferCredit[]> {
  return sequelize.query<TransferCredit>(`${SELECT} WHERE c.student_id = :s AND c.course_id = :c ORDER BY c.created_at`, {
    replacements: { s: studentId, c: courseId },
    type: QueryTypes.SELECT,
    transaction: t,
  });
}

/** Item id → the earlier school that item was credited from, for a student's course. */
export async function transferCreditedItems(
  studentId: string,
  courseId: string,
): Promise<Map<string, { sourceSchool: string; on: string }>> {
  const rows = await sequelize.query<{ itemId: string; sourceSchool: string; on: string }>(
    `SELECT ci.syllabus_item_id AS "itemId", c.source_school AS "sourceSchool", to_char(c.test_taken_on, 'YYYY-MM-DD') AS "on"
       FROM transfer_credit_items ci JOIN transfer_credits c ON c.id = ci.credit_id
      WHERE c.student_id = :s AND c.course_id = :c ORDER BY c.created_at`,
    { replacements: { s: studentId, c: courseId }, type: QueryTypes.SELECT },
  );
  return new Map(rows.map((r) => [r.itemId, { sourceSchool: r.sourceSchool, on: r.on }]));
}

export const TRANSFER_CREDITS_PAGE_SIZE = 25;

/**
 * One page of the school's transfer credits, newest first (the chief's Transfers page), optionally
 * narrowed to students whose name contains `name`, with the number that match from one count: two
 * queries however many credits the school has recorded over the years.
 */
export async function transferCreditsPage(
  user: CurrentUser,
  filter: { name?: string | undefined } = {},
  opts: { page?: number; pageSize?: number } = {},
): Promise<{ rows: TransferCredit[]; total: number; page: number; pageSize: number }> {
  if (!can(user, "transfers.manage")) throw new HttpError(403, "Only the chief instructor reads transfer credits");
  const pageSize = opts.pageSize ?? TRANSFER_CREDITS_PAGE_SIZE;
  const page = Math.max(1, Math.floor(opts.page ?? 1));
  const replacements = { school: user.schoolId, name: filter.name ? containsPattern(filter.name) : null };
  const where = "c.school_id = :school AND (CAST(:name AS text) IS NULL OR sp.name ILIKE CAST(:name AS text))";
  const [rows, [count]] = await Promise.all([
    sequelize.query<TransferCredit>(`${SELECT} WHERE ${where} ORDER BY c.created_at DESC, c.id DESC LIMIT :limit OFFSET :offset`, {
      replacements: { ...replacements, limit: pageSize, offset: (page - 1) * pageSize },
      type: QueryTypes.SELECT,
    }),
    sequelize.query<{ n: number }>(
      `SELECT count(*)::int AS n FROM transfer_credits c JOIN people sp ON sp.id = c.student_id WHERE ${where}`,
      { replacements, type: QueryTypes.SELECT },
    ),
  ]);
  return { rows, total: count?.n ?? 0, page, pageSize };
}

/** The evidence file of a credit of the caller's school; null when there is none. */
export async function transferEvidence(
  user: CurrentUser,
  creditId: string,
): Promise<{ fileName: string; contentType: "application/pdf" | "image/png" | "image/jpeg"; content: Buffer } | null> {
  if (!can(user, "transfers.manage")) throw new HttpError(403, "Only the chief instructor reads transfer evidence");
  const [row] = await sequelize.query<{ fileName: string; contentType: "application/pdf" | "image/png" | "image/jpeg"; content: Buffer }>(
    `SELECT evidence_file_name AS "fileName", evidence_content_type AS "contentType", evidence AS content
       FROM transfer_credits WHERE id = :id AND school_id = :school`,
    { replacements: { id: creditId, school: user.schoolId }, type: QueryTypes.SELECT },
  );
  return row ?? null;
}
