import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import type { AssignmentKind } from "../../models";
import { can } from "@/lib/auth/can";
import type { CurrentUser } from "@/lib/auth/session";
import { isOverdue } from "@/lib/assignments/overdue";
import { schoolToday } from "./school-today";

// Assignments as staff see them: the list with completion counts, and one assignment's completion.

export interface StaffAssignmentRow {
  id: string;
  kind: AssignmentKind;
  title: string;
  briefingId: string | null;
  demoId: string | null;
  target: string;
  cohortId: string | null;
  dueOn: string;
  assignedByName: string;
  students: number;
  done: number;
  overdue: number;
}

export const ASSIGNMENTS_PAGE_SIZE = 50;

/**
 * Assignments a staff member sees: one who may see every student the school's, an instructor those
 * for students of cohorts they lead or that they set; optionally one assignment by id. Newest due
 * first (then title, id), `limit`/`offset` applied in SQL, completion counts for those rows only.
 */
async function readStaffAssignments(
  caller: CurrentUser,
  opts: { assignmentId?: string; limit: number; offset: number },
): Promise<StaffAssignmentRow[]> {
  const today = await schoolToday(caller.schoolId);
  return sequelize.query<StaffAssignmentRow>(
    `SELECT a.id, a.kind, a.briefing_id AS "briefingId", a.demo_id AS "demoId", a.cohort_id AS "cohortId", a.due_on AS "dueOn",
            a.title, COALESCE(c.name, sp.name) AS target, ap.name AS "assignedByName",
            (SELECT count(*)::int FROM assignment_students s WHERE s.assignment_id = a.id) AS students,
            (SELECT count(*)::int FROM assignment_students s WHERE s.assignment_id = a.id AND s.completed_at IS NOT NULL) AS done,
            (SELECT count(*)::int FROM assignment_students s WHERE s.assignment_id = a.id AND s.completed_at IS NULL AND s.due_on < :today::date) AS overdue
       FROM (${visibleSql} ORDER BY a.due_on DESC, title, a.id LIMIT :limit OFFSET :offset) a
       JOIN people ap ON ap.id = a.assigned_by
       LEFT JOIN cohorts c ON c.id = a.cohort_id
       LEFT JOIN people sp ON sp.id = a.student_id
      ORDER BY a.due_on DESC, a.title, a.id`,
    {
      replacements: { ...visibleReplacements(caller, opts.assignmentId), today, limit: opts.limit, offset: opts.offset },
      type: QueryTypes.SELECT,
    },
  );
}

/** The assignments the caller sees, with their titles (a briefing's current title, else the demo's name). */
const visibleSql = `SELECT a.*, COALESCE(br.title, (SELECT name FROM demos WHERE id = a.demo_id), '—') AS title
       FROM assignments a
       LEFT JOIN cohorts c ON c.id = a.cohort_id
       LEFT JOIN briefings b ON b.id = a.briefing_id
       LEFT JOIN briefing_revisions br ON br.id = b.current_revision_id
      WHERE a.school_id = :schoolId AND (CAST(:assignmentId AS uuid) IS NULL OR a.id = CAST(:assignmentId AS uuid))
        AND (:chief OR a.assigned_by = :viewer OR c.lead_instructor_id = :viewer
             OR EXISTS (SELECT 1 FROM cohort_memberships m JOIN cohorts mc ON mc.id = m.cohort_id
                         WHERE m.student_id = a.student_id AND m.to_date IS NULL AND mc.lead_instructor_id = :viewer))`;

const visibleReplacements = (caller: CurrentUser, assignmentId?: string) => ({
  schoolId: caller.schoolId,
  viewer: caller.id,
  chief: can(caller, "students.all"),
  assignmentId: assignmentId ?? null,
});

/** One page of the assignments the caller sees (newest due first) and how many there are: two queries however many were set. */
export async function staffAssignmentsPage(
  caller: CurrentUser,
  opts: { page?: number; pageSize?: number } = {},
): Promise<{ rows: StaffAssignmentRow[]; total: number; page: number; pageSize: number }> {
  const pageSize = opts.pageSize ?? ASSIGNMENTS_PAGE_SIZE;
  const page = Math.max(1, Math.floor(opts.page ?? 1));
  const [rows, [count]] = await Promise.all([
    readStaffAssignments(caller, { limit: pageSize, offset: (page - 1) * pageSize }),
    sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM (${visibleSql}) a`, {
      replacements: visibleReplacements(caller),
      type: QueryTypes.SELECT,
    }),
  ]);
  return { rows, total: count?.n ?? 0, page, pageSize };
}

export interface CompletionRow {
  studentId: string;
  name: string;
  completedAt: Date | null;
  done: boolean;
  overdue: boolean;
}

/** Completion across the students of one assignment, for staff who may see it; null when not visible. */
export async function assignmentCompletion(
  caller: CurrentUser,
  assignmentId: string,
): Promise<{ assignment: StaffAssignmentRow; rows: CompletionRow[] } | null> {
  const [visible] = await readStaffAssignments(caller, { assignmentId, limit: 1, offset: 0 });
  if (!visible) return null;
  const today = await schoolToday(caller.schoolId);
  const rows = await sequelize.query<{ studentId: string; name: string; completedAt: Date | null; dueOn: string }>(
    `SELECT s.student_id AS "studentId", p.name, s.completed_at AS "completedAt", s.due_on AS "dueOn"
       FROM assignment_students s JOIN people p ON p.id = s.student_id
      WHERE s.assignment_id = :assignmentId ORDER BY p.name`,
    { replacements: { assignmentId }, type: QueryTypes.SELECT },
  );
  return {
    assignment: visible,
    rows: rows.map((r) => ({
      studentId: r.studentId,
      name: r.name,
      completedAt: r.completedAt,
      done: r.completedAt !== null,
      overdue: isOverdue(r.dueOn, r.completedAt !== null, today),
    })),
  };
}
