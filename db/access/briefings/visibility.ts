import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import { can } from "@/lib/auth/can";
import type { CurrentUser } from "@/lib/auth/session";

// Who may read a briefing: one who may read every briefing of the school, or a student it is
// assigned or scheduled for.

/**
 * The SQL condition "student :viewer may read briefing b": assigned to them (directly or through
 * their current cohort), or scheduled for them (a session of it they attend or their cohort's).
 */
const STUDENT_VISIBILITY_SQL = `(EXISTS (SELECT 1 FROM assignment_students s WHERE s.briefing_id = b.id AND s.student_id = :viewer)
  OR EXISTS (
    SELECT 1 FROM training_sessions ts
     WHERE ts.briefing_id = b.id AND ts.school_id = b.school_id AND ts.status <> 'cancelled'
       AND (EXISTS (SELECT 1 FROM session_attendees sa WHERE sa.session_id = ts.id AND sa.student_id = :viewer)
            OR EXISTS (SELECT 1 FROM cohort_memberships m WHERE m.cohort_id = ts.cohort_id AND m.student_id = :viewer AND m.to_date IS NULL))))`;

/** The SQL condition "the caller (:viewer) may read briefing b". */
export function briefingVisibilitySql(caller: CurrentUser): string {
  if (can(caller, "briefings.all")) return "true";
  return can(caller, "briefings.view") ? STUDENT_VISIBILITY_SQL : "false";
}

/** Whether the caller may read a briefing of their school. */
export async function canViewBriefing(caller: CurrentUser, briefingId: string): Promise<boolean> {
  const [row] = await sequelize.query<{ ok: boolean }>(
    `SELECT (${briefingVisibilitySql(caller)}) AS ok FROM briefings b WHERE b.id = :id AND b.school_id = :schoolId`,
    {
      replacements: { id: briefingId, schoolId: caller.schoolId, viewer: caller.id },
      type: QueryTypes.SELECT,
    },
  );
  return !!row?.ok;
}
