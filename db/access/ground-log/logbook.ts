import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import { getSchool } from "../shared/school";
import { accessTo } from "../shared/student-scope";
import { dateInZone } from "@/lib/time";
import type { CurrentUser } from "@/lib/auth/session";
import type { AttendanceStatusName } from "@/lib/timetable/schema";

export interface LogbookLine {
  entryId: string;
  sessionId: string;
  date: string;
  occurredAt: string;
  durationMinutes: number;
  status: AttendanceStatusName;
  subjects: string;
  briefingTitle: string;
  instructorName: string;
  certificateNumber: string | null;
  amended: boolean;
  reason: string | null;
  recordedAt: string;
}

/** The student's logbook: one line per effective Ground log entry, oldest first. */
export async function logbookFor(schoolId: string, studentId: string): Promise<LogbookLine[]> {
  const school = await getSchool(schoolId);
  const rows = await sequelize.query<Omit<LogbookLine, "date" | "occurredAt" | "recordedAt"> & { occurredAt: Date; recordedAt: Date }>(
    `SELECT g.entry_id AS "entryId", g.session_id AS "sessionId", g.occurred_at AS "occurredAt", g.credited_minutes AS "durationMinutes", g.status,
            br.title AS "briefingTitle",
            br.title || COALESCE(' (' || (SELECT string_agg(i.code, ', ' ORDER BY i.code) FROM syllabus_items i WHERE i.id = ANY(g.syllabus_item_ids)) || ')', '') AS subjects,
            ip.name AS "instructorName",
            (SELECT q.certificate_number FROM instructor_qualifications_current q WHERE q.person_id = g.instructor_id ORDER BY q.issued_on DESC LIMIT 1) AS "certificateNumber",
            g.amendment_count > 0 AS amended, g.reason, g.recorded_at AS "recordedAt"
       FROM ground_log_current g JOIN briefing_revisions br ON br.id = g.briefing_revision_id JOIN people ip ON ip.id = g.instructor_id
      WHERE g.student_id = :s AND g.school_id = :school
      ORDER BY g.occurred_at, g.entry_id`,
    { replacements: { s: studentId, school: schoolId }, type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({
    ...r,
    occurredAt: new Date(r.occurredAt).toISOString(),
    recordedAt: new Date(r.recordedAt).toISOString(),
    date: dateInZone(new Date(r.occurredAt), school.timeZone),
  }));
}

/** The logbook with its student's name, if the caller may see that student's Ground log (for the CSV download); else null. */
export async function logbookDownload(user: CurrentUser, studentId: string): Promise<{ studentName: string; lines: LogbookLine[] } | null> {
  if (!(await accessTo(user, studentId, "groundlog"))) return null;
  const [p] = await sequelize.query<{ name: string }>(`SELECT name FROM people WHERE id = :id AND school_id = :school`, {
    replacements: { id: studentId, school: user.schoolId },
    type: QueryTypes.SELECT,
  });
  if (!p) return null;
  return { studentName: p.name, lines: await logbookFor(user.schoolId, studentId) };
}
