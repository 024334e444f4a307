import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { moveStudentToCohort } from "../cohorts/memberships";
import { HttpError } from "@/lib/http/errors";
import { formatDay } from "@/lib/time";
import { can } from "@/lib/auth/can";
import type { CurrentUser } from "@/lib/auth/session";
import type { MoveStudentInput } from "@/lib/roster/schema";

/** Moves a student to another cohort from a date; the old membership is kept with its end date. */
export async function moveStudent(user: CurrentUser, input: MoveStudentInput, t: Transaction) {
  // the target may be any cohort of the school (the student moves to another lead); the caller must lead the current one
  const [target] = await sequelize.query<{ id: string }>(`SELECT id FROM cohorts WHERE id = :c AND school_id = :s`, {
    replacements: { c: input.toCohortId, s: user.schoolId },
    type: QueryTypes.SELECT,
    transaction: t,
  });
  if (!target) throw new HttpError(404, "toCohortId: no such cohort", "toCohortId");
  const [current] = await sequelize.query<{ cohortId: string; fromDate: string; leadInstructorId: string; schoolId: string }>(
    `SELECT m.cohort_id AS "cohortId", m.from_date AS "fromDate", c.lead_instructor_id AS "leadInstructorId", c.school_id AS "schoolId"
       FROM cohort_memberships m JOIN cohorts c ON c.id = m.cohort_id
      WHERE m.student_id = :s AND m.to_date IS NULL`,
    { replacements: { s: input.studentId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!current || current.schoolId !== user.schoolId) throw new HttpError(404, "studentId: no such student in a cohort", "studentId");
  if (!can(user, "roster.all") && current.leadInstructorId !== user.id) {
    throw new HttpError(403, "studentId: only the student's lead instructor or the chief instructor may move them", "studentId");
  }
  if (current.cohortId === input.toCohortId) throw new HttpError(409, "toCohortId: the student is already in this cohort", "toCohortId");
  if (input.onDate <= current.fromDate)
    throw new HttpError(400, `onDate: must be after the current membership began (${formatDay(current.fromDate)})`, "onDate");
  return moveStudentToCohort(
    { schoolId: user.schoolId, studentId: input.studentId, toCohortId: input.toCohortId, onDate: input.onDate },
    t,
  );
}
