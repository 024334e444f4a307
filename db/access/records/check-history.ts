import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import type { LevelOfLearning, QuestionOutcome, CheckOutcome, ItemOutcome } from "@/lib/records/outcome";
import type { GeneratedQuestion } from "@/lib/records/questions";

// A student's oral checks with their questions, newest first.

export interface CheckSummary {
  id: string;
  occurredAt: Date;
  recordedAt: Date;
  instructorName: string;
  levelShown: LevelOfLearning;
  outcome: CheckOutcome;
  itemCodes: string[];
  itemOutcomes: ItemOutcome[];
  durationMinutes: number;
  withdrawn: { reason: string; at: Date; byName: string } | null;
  amendedBy: string | null;
  amends: { id: string; reason: string } | null;
  acknowledgedAt: Date | null;
  /** internal: only for staff */
  remarks?: string;
  questions: {
    position: number;
    itemCode: string;
    text: string;
    answerSummary: string;
    outcome: QuestionOutcome;
    required: boolean;
    prompted: boolean;
    correctiveGiven: boolean;
    generated: GeneratedQuestion | null;
    studentFigure: number | null;
  }[];
}

/** Checks of a student, newest first. Remarks only when `withRemarks` (staff). */
export async function listChecksOfStudent(
  schoolId: string,
  studentId: string,
  opts: { withRemarks: boolean; limit?: number },
): Promise<CheckSummary[]> {
  const rows = await sequelize.query<
    Omit<CheckSummary, "questions" | "withdrawn" | "amends"> & {
      remarks: string;
      w_reason: string | null;
      w_at: Date | null;
      w_by: string | null;
      amends_id: string | null;
      amend_reason: string | null;
    }
  >(
    `SELECT c.id, c.occurred_at AS "occurredAt", c.recorded_at AS "recordedAt", p.name AS "instructorName", c.level_shown AS "levelShown",
            c.outcome, c.item_outcomes AS "itemOutcomes", c.duration_minutes AS "durationMinutes", c.remarks,
            (SELECT array_agg(i.code ORDER BY i.code) FROM oral_check_items ci JOIN syllabus_items i ON i.id = ci.syllabus_item_id WHERE ci.check_id = c.id) AS "itemCodes",
            w.reason AS w_reason, w.withdrawn_at AS w_at, wp.name AS w_by,
            (SELECT a.id FROM oral_checks a WHERE a.amends_id = c.id) AS "amendedBy",
            c.amends_id, c.amend_reason, k.acknowledged_at AS "acknowledgedAt"
       FROM oral_checks c JOIN people p ON p.id = c.instructor_id
       LEFT JOIN oral_check_withdrawals w ON w.check_id = c.id LEFT JOIN people wp ON wp.id = w.withdrawn_by
       LEFT JOIN oral_check_acknowledgements k ON k.check_id = c.id
      WHERE c.school_id = :schoolId AND c.student_id = :studentId
      ORDER BY c.occurred_at DESC LIMIT :limit`,
    { replacements: { schoolId, studentId, limit: opts.limit ?? 200 }, type: QueryTypes.SELECT },
  );
  const ids = rows.map((r) => r.id);
  const qs = ids.length
    ? await sequelize.query<{
        check_id: string;
        position: number;
        item_code: string;
        question_text: string;
        answer_summary: string;
        outcome: QuestionOutcome;
        required: boolean;
        prompted: boolean;
        corrective_given: boolean;
        generated: GeneratedQuestion | null;
        student_figure: number | null;
      }>(`SELECT * FROM oral_check_questions WHERE check_id IN (:ids) ORDER BY check_id, position`, {
        replacements: { ids },
        type: QueryTypes.SELECT,
      })
    : [];
  return rows.map((r) => ({
    id: r.id,
    occurredAt: r.occurredAt,
    recordedAt: r.recordedAt,
    instructorName: r.instructorName,
    levelShown: r.levelShown,
    outcome: r.outcome,
    itemCodes: r.itemCodes ?? [],
    itemOutcomes: r.itemOutcomes,
    durationMinutes: r.durationMinutes,
    withdrawn: r.w_reason ? { reason: r.w_reason, at: r.w_at!, byName: r.w_by ?? "" } : null,
    amendedBy: r.amendedBy,
    amends: r.amends_id ? { id: r.amends_id, reason: r.amend_reason ?? "" } : null,
    acknowledgedAt: r.acknowledgedAt,
    ...(opts.withRemarks ? { remarks: r.remarks } : {}),
    questions: qs
      .filter((q) => q.check_id === r.id)
      .map((q) => ({
        position: q.position,
        itemCode: q.item_code,
        text: q.question_text,
        answerSummary: q.answer_summary,
        outcome: q.outcome,
        required: q.required,
        prompted: q.prompted,
        correctiveGiven: q.corrective_given,
        generated: q.generated,
        studentFigure: q.student_figure,
      })),
  }));
}
