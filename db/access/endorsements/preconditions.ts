import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { HttpError } from "@/lib/http/errors";
import type { StudentRef } from "../shared/enrolment";
import { RecordRefusal } from "../records/refusals";
import { refuseUnlessStanding } from "../records/signer-standing";
import { courseGaps, groundTimeShort } from "../shared/course-completion";
import { hoursLabel } from "@/lib/time";

// What must hold before a knowledge-test endorsement: every failing precondition is named, not
// only the first, so the instructor sees the whole list at once.

export type EndorsementReason =
  | "items_unsigned"
  | "stage_checks_not_passed"
  | "makeup_open"
  | "ground_hours_short"
  | "signer_not_qualified"
  | "signer_not_current"
  | "remedial_open"
  | "attempt_limit"
  | "awaiting_result";

export interface Unmet {
  reason: EndorsementReason;
  message: string;
}

/** A refusal listing every unmet precondition (422); `reasons` in the order checked. */
export class EndorsementRefusal extends HttpError {
  constructor(public unmet: Unmet[]) {
    super(422, `studentId: not ready for the knowledge-test endorsement: ${unmet.map((u) => u.message).join("; ")}`, "studentId");
    this.name = "EndorsementRefusal";
  }
  get reasons(): EndorsementReason[] {
    return this.unmet.map((u) => u.reason);
  }
}

/** Open remedial items of the student's last failed result (a retest needs that training first). */
export async function openRemedialsOfLastFail(studentId: string, courseId: string, t?: Transaction): Promise<string[]> {
  const rows = await sequelize.query<{ area: string }>(
    `SELECT m.area FROM knowledge_test_remedials m
      WHERE m.state = 'open' AND m.result_id = (
        SELECT r.id FROM knowledge_test_results r WHERE r.student_id = :studentId AND r.course_id = :courseId AND NOT r.passed
         ORDER BY r.taken_on DESC, r.created_at DESC LIMIT 1)
      ORDER BY m.area`,
    { replacements: { studentId, courseId }, type: QueryTypes.SELECT, transaction: t },
  );
  return rows.map((r) => r.area);
}

export async function unmetPreconditions(
  student: StudentRef,
  instructorId: string,
  onDate: string,
  attemptLimit: number,
  t?: Transaction,
): Promise<{ unmet: Unmet[]; attempt: number }> {
  const unmet: Unmet[] = [];
  const gaps = await courseGaps(student, t);
  if (gaps.unsignedItems.length)
    unmet.push({ reason: "items_unsigned", message: `items not signed off: ${gaps.unsignedItems.join(", ")}` });
  if (gaps.stagesNotPassed.length)
    unmet.push({ reason: "stage_checks_not_passed", message: `stage checks not passed: ${gaps.stagesNotPassed.join(", ")}` });
  if (gaps.openMakeups.length) unmet.push({ reason: "makeup_open", message: `open make-up items: ${gaps.openMakeups.join(", ")}` });
  if (groundTimeShort(gaps))
    unmet.push({
      reason: "ground_hours_short",
      message: `credited ground hours ${hoursLabel(gaps.creditedMinutes)} are below the course minimum of ${hoursLabel(gaps.minimumMinutes)}`,
    });

  try {
    await refuseUnlessStanding(instructorId, student, onDate, "endorse students", t);
  } catch (e) {
    if (!(e instanceof RecordRefusal) || (e.reason !== "signer_not_qualified" && e.reason !== "signer_not_current")) throw e;
    unmet.push({ reason: e.reason, message: e.message.replace(/^signer: /, "") });
  }

  const [history] = await sequelize.query<{ results: number; endorsements: number }>(
    `SELECT (SELECT count(*)::int FROM knowledge_test_results WHERE student_id = :s AND course_id = :c) AS results,
            (SELECT count(*)::int FROM knowledge_test_endorsements WHERE student_id = :s AND course_id = :c) AS endorsements`,
    { replacements: { s: student.id, c: student.courseId }, type: QueryTypes.SELECT, transaction: t },
  );
  const results = history?.results ?? 0;
  const endorsements = history?.endorsements ?? 0;
  if (endorsements > results)
    unmet.push({ reason: "awaiting_result", message: "the last endorsement has no result yet: record it before endorsing again" });
  const remedial = await openRemedialsOfLastFail(student.id, student.courseId, t);
  if (remedial.length)
    unmet.push({
      reason: "remedial_open",
      message: `remedial training of the last failed test is still open: ${remedial.join(", ")}`,
    });
  if (results >= attemptLimit) unmet.push({ reason: "attempt_limit", message: `the attempt limit of ${attemptLimit} tests is reached` });
  return { unmet, attempt: endorsements + 1 };
}
