import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { HttpError } from "@/lib/http/errors";
import { can } from "@/lib/auth/can";
import type { CurrentUser } from "@/lib/auth/session";

export interface LockedSession {
  id: string;
  schoolId: string;
  instructorId: string;
  cohortLeadId: string | null;
  startsAt: Date;
  endsAt: Date;
  room: string;
  status: "scheduled" | "cancelled";
  sequence: number;
  title: string;
  instructorName: string;
}

/** Whether the caller runs the session: its instructor, its cohort's lead instructor, or a caller with `timetable.manage`. */
export function runsSession(user: CurrentUser, s: { instructorId: string; cohortLeadId: string | null }): boolean {
  return can(user, "timetable.manage") || s.instructorId === user.id || s.cohortLeadId === user.id;
}

/** Locks a session for a change; only its instructor, its cohort's lead instructor or a caller with `timetable.manage` may change it. */
export async function lockSessionForChange(user: CurrentUser, sessionId: string, t: Transaction): Promise<LockedSession> {
  const [s] = await sequelize.query<LockedSession>(
    `SELECT s.id, s.school_id AS "schoolId", s.instructor_id AS "instructorId", c.lead_instructor_id AS "cohortLeadId",
            s.starts_at AS "startsAt", s.ends_at AS "endsAt", s.room, s.status, s.sequence, br.title, p.name AS "instructorName"
       FROM training_sessions s JOIN briefing_revisions br ON br.id = s.briefing_revision_id
       JOIN people p ON p.id = s.instructor_id LEFT JOIN cohorts c ON c.id = s.cohort_id
      WHERE s.id = :id AND s.school_id = :school FOR UPDATE OF s`,
    { replacements: { id: sessionId, school: user.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!s) throw new HttpError(404, "sessionId: no such session", "sessionId");
  if (!runsSession(user, s)) {
    throw new HttpError(
      403,
      "sessionId: only the session's instructor, the cohort's lead instructor or the chief instructor may change it",
      "sessionId",
    );
  }
  return s;
}

/** A session whose attendance is recorded cannot be moved or cancelled (`what`: "moved" | "cancelled"). */
export async function assertNoAttendanceRecorded(sessionId: string, what: "moved" | "cancelled", t: Transaction): Promise<void> {
  const [recorded] = await sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM ground_log_entries WHERE session_id = :id`, {
    replacements: { id: sessionId },
    type: QueryTypes.SELECT,
    transaction: t,
  });
  if ((recorded?.n ?? 0) > 0)
    throw new HttpError(409, `sessionId: attendance is already recorded for this session; it cannot be ${what}`, "sessionId");
}
