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
  // One due date per thing: a demo also reached through an assigned briefing (whose current
  // revision uses it) is due on the earliest of its own date and those briefings' dates.
  const rows = await sequelize.query<Omit<StudentAssignment, "done" | "overdue">>(
    `WITH mine AS (
       SELECT s.*, CASE WHEN s.kind = 'demo' THEN LEAST(s.due_on, (
                SELECT min(sb.due_on) FROM assignment_students sb
                  JOIN briefings b2 ON b2.id = sb.briefing_id
                  JOIN briefing_revision_demos bd ON bd.briefing_revision_id = b2.current_revision_id
                  JOIN demo_revisions dr ON dr.id = bd.demo_revision_id
                 WHERE sb.student_id = s.student_id AND sb.school_id = s.school_id AND sb.kind = 'briefing' AND dr.demo_id = s.demo_id))
              ELSE s.due_on END AS effective_due
         FROM assignment_students s WHERE s.school_id = :schoolId AND s.student_id = :studentId)
     SELECT s.assignment_id AS id, s.kind, s.briefing_id AS "briefingId", s.demo_id AS "demoId", s.effective_due AS "dueOn",
            a.note, ap.name AS "assignedByName", s.completed_at AS "completedAt",
            COALESCE(br.title, (SELECT name FROM demos WHERE id = s.demo_id), '—') AS title
       FROM mine s
       JOIN assignments a ON a.id = s.assignment_id
       JOIN people ap ON ap.id = a.assigned_by
       LEFT JOIN briefings b ON b.id = s.briefing_id
       LEFT JOIN briefing_revisions br ON br.id = b.current_revision_id
      WHERE (:from::date IS NULL OR s.effective_due >= :from::date) AND (:to::date IS NULL OR s.effective_due <= :to::date)
      ORDER BY s.completed_at IS NOT NULL, s.effective_due, title`,
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
