import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { openMakeupForAbsence } from "./makeup-from-attendance";
import { sessionForRecord } from "./attendance-session";
import { confirmPassword } from "../records/sign-offs";
import { HttpError } from "@/lib/http/errors";
import { now } from "@/lib/clock";
import { creditFor, isAbsence } from "@/lib/timetable/crediting";
import type { CurrentUser } from "@/lib/auth/session";
import type { AmendEntryOutput, AttendanceStatusName } from "@/lib/timetable/schema";

/**
 * Corrects an entry by appending an amendment (the original stays). Only the current entry of a
 * student and session may be amended, so the chain stays a single line. The amender re-enters their
 * password (`password`, a 422 naming the field when it does not match, nothing written).
 */
export async function amendEntry(user: CurrentUser, input: AmendEntryOutput, t: Transaction) {
  const [cur] = await sequelize.query<{ entryId: string; sessionId: string; studentId: string; status: AttendanceStatusName }>(
    `SELECT g.entry_id AS "entryId", g.session_id AS "sessionId", g.student_id AS "studentId", g.status
       FROM ground_log_entries e JOIN ground_log_current g ON g.student_id = e.student_id AND g.session_id = e.session_id
      WHERE e.id = :id AND e.school_id = :school`,
    { replacements: { id: input.entryId, school: user.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!cur) throw new HttpError(404, "entryId: no such Ground log entry", "entryId");
  const s = await sessionForRecord(user, cur.sessionId, t);
  if (cur.entryId !== input.entryId) throw new HttpError(409, "entryId: this entry was already amended; amend the latest one", "entryId");
  // signed as a sign-off is: a wrong password writes nothing
  await confirmPassword(user, input.password, t);
  const c = creditFor(s.minutes, input);
  const [row] = await sequelize
    .query<{ id: string }>(
      `INSERT INTO ground_log_entries (school_id, student_id, course_id, session_id, briefing_revision_id, syllabus_item_ids, instructor_id,
                                     status, late_minutes, early_minutes, credited_minutes, occurred_at, recorded_by, amends_entry_id, reason)
     SELECT school_id, student_id, course_id, session_id, briefing_revision_id, syllabus_item_ids, instructor_id,
            :status, :late, :early, :credited, occurred_at, :by, id, :reason
       FROM ground_log_entries WHERE id = :id
     RETURNING id`,
      {
        replacements: {
          id: input.entryId,
          status: input.status,
          late: c.late,
          early: c.early,
          credited: c.credited,
          by: user.id,
          reason: input.reason,
        },
        type: QueryTypes.SELECT,
        transaction: t,
      },
    )
    .catch((e) => {
      if ((e as { parent?: { code?: string } }).parent?.code === "23505")
        throw new HttpError(409, "entryId: this entry was already amended; amend the latest one", "entryId");
      throw e;
    });
  const wasAbsent = isAbsence(cur.status);
  const nowAbsent = isAbsence(input.status);
  if (!wasAbsent && nowAbsent)
    await openMakeupForAbsence(t, { schoolId: s.schoolId, studentId: cur.studentId, sessionId: s.id, itemIds: s.itemIds });
  if (wasAbsent && !nowAbsent) {
    await sequelize.query(
      `UPDATE makeup_items SET state = 'done', closed_by_kind = 'attendance_amended', closed_by_id = :entry, closed_at = :now, scheduled_session_id = NULL
        WHERE student_id = :student AND source_kind = 'absence' AND source_id = :session AND state IN ('open','scheduled')`,
      { replacements: { entry: row!.id, now: now(), student: cur.studentId, session: s.id }, transaction: t },
    );
  }
  return { entryId: row!.id, credited: c.credited };
}
