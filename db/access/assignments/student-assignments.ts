import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { AssignmentCompletion, type AssignmentKind } from "../../models";
import { HttpError } from "@/lib/http/errors";
import { now } from "@/lib/clock";
import type { CurrentUser } from "@/lib/auth/session";
import { isOverdue } from "@/lib/assignments/overdue";
import { schoolToday } from "./school-today";

// A student's own assignments: the list (done and overdue derived) and marking one done.

export interface StudentAssignment {
  id: string;
  kind: AssignmentKind;
  title: string;
  briefingId: string | null;
  demoId: string | null;
  dueOn: string;
  note: string;
  assignedByName: string;
  completedAt: Date | null;
  done: boolean;
  overdue: boolean;
}

/** A student's own assignments, soonest first, with done and overdue derived for the school's today. */
export async function listAssignmentsForStudent(
  schoolId: string,
  studentId: string,
  opts: { from?: string; to?: string } = {},
): Promise<StudentAssignment[]> {
  const today = await schoolToday(schoolId);
  const rows = await sequelize.query<Omit<StudentAssignment, "done" | "overdue">>(
    `SELECT s.assignment_id AS id, s.kind, s.briefing_id AS "briefingId", s.demo_id AS "demoId", s.due_on AS "dueOn",
            a.note, ap.name AS "assignedByName", s.completed_at AS "completedAt",
            COALESCE(br.title, (SELECT name FROM demos WHERE id = s.demo_id), '—') AS title
       FROM assignment_students s
       JOIN assignments a ON a.id = s.assignment_id
       JOIN people ap ON ap.id = a.assigned_by
       LEFT JOIN briefings b ON b.id = s.briefing_id
       LEFT JOIN briefing_revisions br ON br.id = b.current_revision_id
      WHERE s.school_id = :schoolId AND s.student_id = :studentId
        AND (:from::date IS NULL OR s.due_on >= :from::date) AND (:to::date IS NULL OR s.due_on <= :to::date)
      ORDER BY s.completed_at IS NOT NULL, s.due_on, title`,
    { replacements: { schoolId, studentId, from: opts.from ?? null, to: opts.to ?? null }, type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({ ...r, done: r.completedAt !== null, overdue: isOverdue(r.dueOn, r.completedAt !== null, today) }));
}

/** A student marks their own assignment done (or not done again). 404 when it is not theirs. */
export async function setAssignmentDone(
  caller: CurrentUser,
  assignmentId: string,
  done: boolean,
  t: Transaction,
): Promise<{ done: boolean }> {
  const [mine] = await sequelize.query<{ id: string }>(
    `SELECT assignment_id AS id FROM assignment_students WHERE assignment_id = :assignmentId AND student_id = :sid AND school_id = :schoolId`,
    { replacements: { assignmentId, sid: caller.id, schoolId: caller.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!mine) throw new HttpError(404, "assignmentId: no such assignment of yours", "assignmentId");
  if (done) {
    await sequelize.query(
      `INSERT INTO assignment_completions (assignment_id, student_id, completed_at) VALUES (:assignmentId, :sid, :at)
       ON CONFLICT (assignment_id, student_id) DO NOTHING`,
      { replacements: { assignmentId, sid: caller.id, at: now() }, transaction: t },
    );
  } else {
    await AssignmentCompletion.destroy({ where: { assignmentId, studentId: caller.id }, transaction: t });
  }
  return { done };
}
