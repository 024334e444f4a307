import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { openMakeupForAbsence, closeMakeupByAttendance } from "./makeup-from-attendance";
import { sessionForRecord } from "./attendance-session";
import { HttpError } from "@/lib/http/errors";
import { now } from "@/lib/clock";
import { creditFor, isAbsence } from "@/lib/timetable/crediting";
import type { CurrentUser } from "@/lib/auth/session";
import type { RecordAttendanceOutput } from "@/lib/timetable/schema";

/**
 * Records attendance after a session: one original Ground log entry per student. An absence opens
 * make-up items for the session's syllabus items; presence closes open make-up items for them.
 */
export async function recordAttendance(user: CurrentUser, input: RecordAttendanceOutput, t: Transaction) {
  const s = await sessionForRecord(user, input.sessionId, t);
  if (s.status !== "scheduled") throw new HttpError(409, "sessionId: the session was cancelled", "sessionId");
  if (new Date(s.endsAt).getTime() > now().getTime())
    throw new HttpError(409, "sessionId: attendance is recorded after the session has ended", "sessionId");
  const attendees = new Set(
    (
      await sequelize.query<{ id: string }>(`SELECT student_id AS id FROM session_attendees WHERE session_id = :id`, {
        replacements: { id: s.id },
        type: QueryTypes.SELECT,
        transaction: t,
      })
    ).map((r) => r.id),
  );
  const seen = new Set<string>();
  const written: { entryId: string; studentId: string; credited: number }[] = [];
  for (const [i, line] of input.lines.entries()) {
    if (!attendees.has(line.studentId))
      throw new HttpError(400, `lines.${i}.studentId: not an attendee of this session`, `lines.${i}.studentId`);
    if (seen.has(line.studentId)) throw new HttpError(400, `lines.${i}.studentId: listed twice`, `lines.${i}.studentId`);
    seen.add(line.studentId);
    let c;
    try {
      c = creditFor(s.minutes, line);
    } catch (e) {
      if (e instanceof HttpError) throw new HttpError(400, `lines.${i}.${e.message}`, `lines.${i}.${e.field}`);
      throw e;
    }
    const [row] = await sequelize.query<{ id: string }>(
      `INSERT INTO ground_log_entries (school_id, student_id, course_id, session_id, briefing_revision_id, syllabus_item_ids, instructor_id,
                                       status, late_minutes, early_minutes, credited_minutes, occurred_at, recorded_by)
       VALUES (:school, :student, :course, :session, :rev, :items::uuid[], :instructor, :status, :late, :early, :credited, :at, :by)
       ON CONFLICT DO NOTHING RETURNING id`,
      {
        replacements: {
          school: s.schoolId,
          student: line.studentId,
          course: s.courseId,
          session: s.id,
          rev: s.briefingRevisionId,
          items: `{${s.itemIds.join(",")}}`,
          instructor: s.instructorId,
          status: line.status,
          late: c.late,
          early: c.early,
          credited: c.credited,
          at: s.startsAt,
          by: user.id,
        },
        type: QueryTypes.SELECT,
        transaction: t,
      },
    );
    if (!row)
      throw new HttpError(
        409,
        `lines.${i}.studentId: attendance is already recorded for this student; correct it with an amendment`,
        `lines.${i}.studentId`,
      );
    written.push({ entryId: row.id, studentId: line.studentId, credited: c.credited });
    if (isAbsence(line.status))
      await openMakeupForAbsence(t, { schoolId: s.schoolId, studentId: line.studentId, sessionId: s.id, itemIds: s.itemIds });
    else await closeMakeupByAttendance(t, { studentId: line.studentId, sessionId: s.id, itemIds: s.itemIds });
  }
  return { recorded: written.length, entries: written };
}
