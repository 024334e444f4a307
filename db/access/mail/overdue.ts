import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";

// Overdue-assignment reminders: which students have an assignment whose due date (the school's
// calendar) has passed without their marking it done, and no reminder about it yet. The outbox key
// is `assignment.overdue:<assignment>:<student>:<due on>`.

/** Overdue reminders are written for assignments due at most this many days ago. */
export const OVERDUE_LOOKBACK_DAYS = 14;

export interface OverdueCandidate {
  assignmentId: string;
  schoolId: string;
  kind: "briefing" | "demo";
  dueOn: string;
  studentId: string;
  name: string;
  email: string;
  title: string | null;
  schoolName: string;
  timeZone: string;
  senderName: string | null;
}

export async function overdueAssignments(at: Date, t: Transaction): Promise<OverdueCandidate[]> {
  return sequelize.query<OverdueCandidate>(
    `SELECT tg.assignment_id AS "assignmentId", tg.school_id AS "schoolId", tg.kind, tg.due_on AS "dueOn", tg.student_id AS "studentId",
            p.name, p.email, COALESCE(br.title, d.name) AS title,
            sc.name AS "schoolName", sc.time_zone AS "timeZone", sc.settings->>'mailSenderName' AS "senderName"
       FROM assignment_students tg -- the briefings area's own answer to "who is this assignment for"
       JOIN schools sc ON sc.id = tg.school_id
       JOIN people p ON p.id = tg.student_id AND p.active AND 'student' = ANY (p.roles)
       LEFT JOIN briefings b ON b.id = tg.briefing_id
       LEFT JOIN briefing_revisions br ON br.id = b.current_revision_id
       LEFT JOIN demos d ON d.id = tg.demo_id
      WHERE tg.due_on < (:at::timestamptz AT TIME ZONE sc.time_zone)::date
        AND tg.due_on >= (:at::timestamptz AT TIME ZONE sc.time_zone)::date - :lookback
        AND NOT EXISTS (SELECT 1 FROM assignment_completions c WHERE c.assignment_id = tg.assignment_id AND c.student_id = tg.student_id)
        AND NOT EXISTS (SELECT 1 FROM outbox o
                         WHERE o.idempotency_key = 'assignment.overdue:' || tg.assignment_id || ':' || tg.student_id || ':' || tg.due_on)
      ORDER BY tg.due_on`,
    { replacements: { at, lookback: OVERDUE_LOOKBACK_DAYS }, type: QueryTypes.SELECT, transaction: t },
  );
}
