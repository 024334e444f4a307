import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import type { AttendanceStatusName } from "@/lib/timetable/schema";

export interface AttendanceSheetLine {
  studentId: string;
  name: string;
  entryId: string | null;
  status: AttendanceStatusName | null;
  lateMinutes: number;
  earlyMinutes: number;
  creditedMinutes: number | null;
  amendmentCount: number;
  history: {
    entryId: string;
    status: AttendanceStatusName;
    creditedMinutes: number;
    reason: string | null;
    recordedAt: string;
    recordedByName: string;
  }[];
}

/** A session's attendees with their current entry and the full chain of entries (originals and amendments). */
export async function attendanceSheet(sessionId: string): Promise<AttendanceSheetLine[]> {
  return sequelize.query<AttendanceSheetLine>(
    `SELECT a.student_id AS "studentId", p.name, g.entry_id AS "entryId", g.status, COALESCE(g.late_minutes, 0) AS "lateMinutes",
            COALESCE(g.early_minutes, 0) AS "earlyMinutes", g.credited_minutes AS "creditedMinutes", COALESCE(g.amendment_count, 0) AS "amendmentCount",
            COALESCE((SELECT json_agg(json_build_object('entryId', e.id, 'status', e.status, 'creditedMinutes', e.credited_minutes, 'reason', e.reason,
                                                        'recordedAt', e.recorded_at, 'recordedByName', rb.name) ORDER BY e.entry_no)
                        FROM ground_log_entries e JOIN people rb ON rb.id = e.recorded_by WHERE e.session_id = a.session_id AND e.student_id = a.student_id), '[]') AS history
       FROM session_attendees a JOIN people p ON p.id = a.student_id
       LEFT JOIN ground_log_current g ON g.session_id = a.session_id AND g.student_id = a.student_id
      WHERE a.session_id = :id ORDER BY p.name`,
    { replacements: { id: sessionId }, type: QueryTypes.SELECT },
  );
}
