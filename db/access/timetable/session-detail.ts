import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import { getSchool } from "../shared/school";
import { studentScopeSql } from "../shared/student-scope";
import { formatInZone, dateInZone } from "@/lib/time";
import { now } from "@/lib/clock";
import { can } from "@/lib/auth/can";
import type { CurrentUser } from "@/lib/auth/session";
import type { SessionRow } from "./list-sessions";

export interface SessionDetail extends SessionRow {
  /** the room in the school's list of rooms (`room` is its name) */
  roomId: string;
  objective: string;
  syllabusItems: { id: string; code: string; title: string }[];
  attendees: { studentId: string; name: string; via: "cohort" | "individual" }[];
  canChange: boolean;
  ended: boolean;
}

/** One session, if the caller may see it (as listSessions: a student only one they attend). */
export async function getSession(user: CurrentUser, sessionId: string): Promise<SessionDetail | null> {
  if (!can(user, "timetable.view")) return null;
  const staff = can(user, "timetable.schedule");
  const f = studentScopeSql(user, "schedule", "a.student_id");
  const school = await getSchool(user.schoolId);
  const [r] = await sequelize.query<
    Omit<SessionRow, "date" | "startLocal" | "endLocal" | "startsAt" | "endsAt"> & {
      startsAt: Date;
      endsAt: Date;
      roomId: string;
      objective: string;
      cohortLeadId: string | null;
    }
  >(
    `SELECT s.id, s.briefing_id AS "briefingId", br.title AS "briefingTitle", br.number AS "revisionNumber", br.objective,
            s.starts_at AS "startsAt", s.ends_at AS "endsAt", (extract(epoch FROM s.ends_at - s.starts_at) / 60)::int AS "durationMinutes",
            s.room, s.room_id AS "roomId", s.instructor_id AS "instructorId", ip.name AS "instructorName", s.cohort_id AS "cohortId", c.name AS "cohortName",
            c.lead_instructor_id AS "cohortLeadId", s.status, s.sequence, s.cancel_reason AS "cancelReason",
            (SELECT count(*)::int FROM session_attendees a WHERE a.session_id = s.id) AS "attendeeCount",
            (SELECT count(DISTINCT g.student_id)::int FROM ground_log_entries g WHERE g.session_id = s.id) AS "recordedCount"
       FROM training_sessions s JOIN briefing_revisions br ON br.id = s.briefing_revision_id
       JOIN people ip ON ip.id = s.instructor_id LEFT JOIN cohorts c ON c.id = s.cohort_id
      WHERE s.id = :id AND s.school_id = :school
        AND (:staff OR EXISTS (SELECT 1 FROM session_attendees a WHERE a.session_id = s.id AND ${f.sql}))`,
    { replacements: { id: sessionId, school: user.schoolId, staff, ...f.replacements }, type: QueryTypes.SELECT },
  );
  if (!r) return null;
  const items = await sequelize.query<{ id: string; code: string; title: string }>(
    `SELECT i.id, i.code, i.title FROM training_sessions s JOIN briefing_revision_items bi ON bi.briefing_revision_id = s.briefing_revision_id
       JOIN syllabus_items i ON i.id = bi.syllabus_item_id WHERE s.id = :id ORDER BY i.code`,
    { replacements: { id: sessionId }, type: QueryTypes.SELECT },
  );
  const attendees = staff
    ? await sequelize.query<{ studentId: string; name: string; via: "cohort" | "individual" }>(
        `SELECT a.student_id AS "studentId", p.name, a.via FROM session_attendees a JOIN people p ON p.id = a.student_id WHERE a.session_id = :id ORDER BY p.name`,
        { replacements: { id: sessionId }, type: QueryTypes.SELECT },
      )
    : [];
  const a = new Date(r.startsAt);
  const e = new Date(r.endsAt);
  const tz = school.timeZone;
  const { cohortLeadId, ...rest } = r;
  return {
    ...rest,
    startsAt: a.toISOString(),
    endsAt: e.toISOString(),
    date: dateInZone(a, tz),
    startLocal: formatInZone(a, tz, "HH:mm"),
    endLocal: formatInZone(e, tz, "HH:mm"),
    syllabusItems: items,
    attendees,
    canChange: staff && (can(user, "timetable.manage") || r.instructorId === user.id || cohortLeadId === user.id),
    ended: e.getTime() <= now().getTime(),
  };
}
