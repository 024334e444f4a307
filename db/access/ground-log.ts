import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import type { z } from "zod";
import { sequelize } from "../index";
import { getSchool } from "./shared/school";
import { openMakeupForAbsence, closeMakeupByAttendance } from "./makeup";
import { HttpError } from "@/lib/http/errors";
import { now } from "@/lib/clock";
import { dateInZone } from "@/lib/time";
import type { CurrentUser } from "@/lib/auth/session";
import type { AttendanceLine, AttendanceStatusName, recordAttendanceSchema, amendEntrySchema } from "@/lib/timetable/schemas";

const ABSENT: AttendanceStatusName[] = ["absent", "absent_excused"];

/**
 * Minutes credited for one student: the session's length less late arrival and early departure
 * for those present, none for an absence. An explicit figure may lower it, never raise it past
 * the session's length, and must be zero for an absence.
 */
export function creditFor(
  sessionMinutes: number,
  line: Pick<AttendanceLine, "status" | "lateMinutes" | "earlyMinutes" | "creditedMinutes">,
): { late: number; early: number; credited: number } {
  const absent = ABSENT.includes(line.status);
  const late = line.status === "late" ? line.lateMinutes : 0;
  const early = line.status === "left_early" ? line.earlyMinutes : 0;
  if (line.status === "late" && late <= 0) throw new HttpError(400, "lateMinutes: say how many minutes late", "lateMinutes");
  if (line.status === "left_early" && early <= 0)
    throw new HttpError(400, "earlyMinutes: say how many minutes early the student left", "earlyMinutes");
  if (late + early >= sessionMinutes && !absent)
    throw new HttpError(
      400,
      "lateMinutes: late arrival and early departure use up the whole session; record an absence instead",
      "lateMinutes",
    );
  const computed = absent ? 0 : sessionMinutes - late - early;
  const explicit = line.creditedMinutes === undefined || line.creditedMinutes === "" ? null : line.creditedMinutes;
  if (explicit === null) return { late, early, credited: computed };
  if (absent && explicit !== 0) throw new HttpError(400, "creditedMinutes: an absence earns no minutes", "creditedMinutes");
  if (explicit > computed) throw new HttpError(400, `creditedMinutes: at most ${computed} for this session and status`, "creditedMinutes");
  return { late, early, credited: explicit };
}

interface SessionForRecord {
  id: string;
  schoolId: string;
  instructorId: string;
  cohortLeadId: string | null;
  briefingRevisionId: string;
  courseId: string;
  startsAt: Date;
  endsAt: Date;
  status: string;
  minutes: number;
  itemIds: string[];
}

async function sessionForRecord(user: CurrentUser, sessionId: string, t: Transaction): Promise<SessionForRecord> {
  const [s] = await sequelize.query<SessionForRecord>(
    `SELECT s.id, s.school_id AS "schoolId", s.instructor_id AS "instructorId", c.lead_instructor_id AS "cohortLeadId",
            s.briefing_revision_id AS "briefingRevisionId", b.course_id AS "courseId", s.starts_at AS "startsAt", s.ends_at AS "endsAt",
            s.status, (extract(epoch FROM s.ends_at - s.starts_at) / 60)::int AS minutes,
            COALESCE((SELECT array_agg(bi.syllabus_item_id ORDER BY bi.syllabus_item_id) FROM briefing_revision_items bi WHERE bi.briefing_revision_id = s.briefing_revision_id), '{}') AS "itemIds"
       FROM training_sessions s JOIN briefings b ON b.id = s.briefing_id LEFT JOIN cohorts c ON c.id = s.cohort_id
      WHERE s.id = :id AND s.school_id = :school FOR UPDATE OF s`,
    { replacements: { id: sessionId, school: user.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!s) throw new HttpError(404, "sessionId: no such session", "sessionId");
  if (!user.roles.includes("chief") && s.instructorId !== user.id && s.cohortLeadId !== user.id) {
    throw new HttpError(
      403,
      "sessionId: only the session's instructor, the cohort's lead instructor or the chief instructor records its attendance",
      "sessionId",
    );
  }
  return s;
}

/**
 * Records attendance after a session: one original Ground log entry per student. An absence opens
 * make-up items for the session's syllabus items; presence closes open make-up items for them.
 */
export async function recordAttendance(user: CurrentUser, input: z.output<typeof recordAttendanceSchema>, t: Transaction) {
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
    if (ABSENT.includes(line.status))
      await openMakeupForAbsence(t, { schoolId: s.schoolId, studentId: line.studentId, sessionId: s.id, itemIds: s.itemIds });
    else await closeMakeupByAttendance(t, { studentId: line.studentId, sessionId: s.id, itemIds: s.itemIds });
  }
  return { recorded: written.length, entries: written };
}

/**
 * Corrects an entry by appending an amendment (the original stays). Only the current entry of a
 * student and session may be amended, so the chain stays a single line.
 */
export async function amendEntry(user: CurrentUser, input: z.output<typeof amendEntrySchema>, t: Transaction) {
  const [cur] = await sequelize.query<{ entryId: string; sessionId: string; studentId: string; status: AttendanceStatusName }>(
    `SELECT g.entry_id AS "entryId", g.session_id AS "sessionId", g.student_id AS "studentId", g.status
       FROM ground_log_entries e JOIN ground_log_current g ON g.student_id = e.student_id AND g.session_id = e.session_id
      WHERE e.id = :id AND e.school_id = :school`,
    { replacements: { id: input.entryId, school: user.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!cur) throw new HttpError(404, "entryId: no such Ground log entry", "entryId");
  const s = await sessionForRecord(user, cur.sessionId, t);
  if (cur.entryId !== input.entryId) throw new HttpError(409, "entryId: this entry was already amended; amend the latest one", "entryId");
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
  const wasAbsent = ABSENT.includes(cur.status);
  const nowAbsent = ABSENT.includes(input.status);
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

// ---------------------------------------------------------------- reading

/** Whether the caller may see this student's Ground log: self, their sponsor (if shared), an instructor who led them, the chief. */
export async function mayViewGroundLog(user: CurrentUser, studentId: string): Promise<boolean> {
  const [row] = await sequelize.query<{ ok: boolean }>(
    `SELECT EXISTS (
       SELECT 1 FROM people p WHERE p.id = :student AND p.school_id = :school AND 'student' = ANY(p.roles) AND (
         p.id = :uid
         OR (:chief AND true)
         OR (:instructor AND EXISTS (SELECT 1 FROM cohort_memberships m JOIN cohorts c ON c.id = m.cohort_id WHERE m.student_id = p.id AND c.lead_instructor_id = :uid))
         OR (:instructor AND EXISTS (SELECT 1 FROM session_attendees a JOIN training_sessions s ON s.id = a.session_id WHERE a.student_id = p.id AND s.instructor_id = :uid))
         OR (:sponsor AND EXISTS (SELECT 1 FROM sponsor_links l WHERE l.student_id = p.id AND l.sponsor_id = :uid AND l.shares_hours AND l.shares_attendance))
       )) AS ok`,
    {
      replacements: {
        student: studentId,
        school: user.schoolId,
        uid: user.id,
        chief: user.roles.includes("chief"),
        instructor: user.roles.includes("instructor"),
        sponsor: user.roles.includes("sponsor"),
      },
      type: QueryTypes.SELECT,
    },
  );
  return !!row?.ok;
}

export interface StageHours {
  stageCode: string | null;
  stageTitle: string;
  minutes: number;
}

export interface GroundHours {
  courseId: string;
  courseCode: string;
  courseTitle: string;
  minimumMinutes: number;
  creditedMinutes: number;
  byStage: StageHours[];
}

/**
 * Credited minutes per stage and for the course. An entry whose syllabus items fall in several
 * stages is shared equally among them; one with no items counts under "Not tied to a stage".
 */
export async function groundHoursFor(studentId: string, courseId: string): Promise<GroundHours | null> {
  const [course] = await sequelize.query<{ code: string; title: string; min: number }>(
    `SELECT code, title, min_ground_minutes AS min FROM courses WHERE id = :c`,
    { replacements: { c: courseId }, type: QueryTypes.SELECT },
  );
  if (!course) return null;
  const stages = await sequelize.query<{ stageCode: string | null; stageTitle: string | null; minutes: number }>(
    `WITH cur AS (SELECT entry_id, credited_minutes, syllabus_item_ids FROM ground_log_current WHERE student_id = :s AND course_id = :c),
          st AS (SELECT cur.entry_id, cur.credited_minutes, ss.code, ss.title, min(ss.position) AS pos
                   FROM cur LEFT JOIN syllabus_items i ON i.id = ANY(cur.syllabus_item_ids) LEFT JOIN syllabus_stages ss ON ss.id = i.stage_id
                  GROUP BY cur.entry_id, cur.credited_minutes, ss.code, ss.title),
          shared AS (SELECT st.*, st.credited_minutes::numeric / count(*) OVER (PARTITION BY st.entry_id) AS share FROM st)
     SELECT code AS "stageCode", title AS "stageTitle", round(sum(share))::int AS minutes, min(pos) AS pos
       FROM shared GROUP BY code, title ORDER BY min(pos) NULLS LAST, code`,
    { replacements: { s: studentId, c: courseId }, type: QueryTypes.SELECT },
  );
  const [total] = await sequelize.query<{ minutes: number }>(
    `SELECT COALESCE(sum(credited_minutes), 0)::int AS minutes FROM ground_log_current WHERE student_id = :s AND course_id = :c`,
    { replacements: { s: studentId, c: courseId }, type: QueryTypes.SELECT },
  );
  return {
    courseId,
    courseCode: course.code,
    courseTitle: course.title,
    minimumMinutes: course.min,
    creditedMinutes: total?.minutes ?? 0,
    byStage: stages.map((r) => ({ stageCode: r.stageCode, stageTitle: r.stageTitle ?? "Not tied to a stage", minutes: r.minutes })),
  };
}

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
            (SELECT q.certificate_number FROM instructor_qualifications q WHERE q.person_id = g.instructor_id ORDER BY q.issued_on DESC LIMIT 1) AS "certificateNumber",
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

/** Students whose Ground log the caller may open from the Ground log page. */
export async function groundLogStudentsFor(user: CurrentUser): Promise<{ id: string; name: string; cohortName: string | null }[]> {
  if (user.roles.includes("chief") || user.roles.includes("instructor")) {
    return sequelize.query(
      `SELECT p.id, p.name, c.name AS "cohortName" FROM people p
         LEFT JOIN cohort_memberships m ON m.student_id = p.id AND m.to_date IS NULL LEFT JOIN cohorts c ON c.id = m.cohort_id
        WHERE p.school_id = :school AND 'student' = ANY(p.roles)
          AND (:chief OR EXISTS (SELECT 1 FROM cohort_memberships hm JOIN cohorts hc ON hc.id = hm.cohort_id WHERE hm.student_id = p.id AND hc.lead_instructor_id = :uid)
               OR EXISTS (SELECT 1 FROM session_attendees sa JOIN training_sessions ts ON ts.id = sa.session_id WHERE sa.student_id = p.id AND ts.instructor_id = :uid))
        ORDER BY c.name NULLS LAST, p.name`,
      { replacements: { school: user.schoolId, chief: user.roles.includes("chief"), uid: user.id }, type: QueryTypes.SELECT },
    );
  }
  if (user.roles.includes("sponsor")) {
    return sequelize.query(
      `SELECT p.id, p.name, NULL AS "cohortName" FROM sponsor_links l JOIN people p ON p.id = l.student_id
        WHERE l.sponsor_id = :uid AND l.shares_hours AND l.shares_attendance ORDER BY p.name`,
      { replacements: { uid: user.id }, type: QueryTypes.SELECT },
    );
  }
  return [];
}
