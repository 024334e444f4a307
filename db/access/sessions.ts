import "server-only";
import { createHash, randomBytes } from "node:crypto";
import ical, { ICalEventStatus } from "ical-generator";
import { QueryTypes, type Transaction } from "sequelize";
import type { z } from "zod";
import { sequelize } from "../index";
import { getSchool } from "./shared/school";
import { enqueueMail } from "./outbox";
import { composeMail } from "@/lib/mail/compose";
import { HttpError } from "@/lib/http/errors";
import { formatInZone, zonedInstant, dateInZone } from "@/lib/time";
import { now } from "@/lib/clock";
import type { CurrentUser } from "@/lib/auth/session";
import type { scheduleSessionSchema, rescheduleSessionSchema, cancelSessionSchema, SessionsQuery } from "@/lib/timetable/schemas";

type Db = { transaction?: Transaction };

/** The school's name, time zone and mail sender, read inside the caller's transaction (the seed creates the school in it). */
export async function schoolInTx(schoolId: string, t?: Transaction): Promise<{ name: string; timeZone: string; senderName?: string }> {
  const [row] = await sequelize.query<{ name: string; timeZone: string; senderName: string | null }>(
    `SELECT name, time_zone AS "timeZone", settings->>'mailSenderName' AS "senderName" FROM schools WHERE id = :id`,
    { replacements: { id: schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!row) throw new Error("School not found");
  return { name: row.name, timeZone: row.timeZone, senderName: row.senderName ?? undefined };
}

function isChief(user: CurrentUser) {
  return user.roles.includes("chief");
}

/** The Postgres error behind a Sequelize error, if any. */
function pgError(e: unknown): { code?: string; constraint?: string } | null {
  const err = e as { parent?: { code?: string; constraint?: string }; original?: { code?: string; constraint?: string } };
  return err?.parent ?? err?.original ?? null;
}

interface Range {
  startsAt: Date;
  endsAt: Date;
}

/**
 * Turns an exclusion-constraint refusal into a 409 that says who or what is busy, and when.
 * Runs after the failed statement's savepoint was rolled back, so the transaction is usable.
 */
async function conflictError(
  t: Transaction,
  constraint: string | undefined,
  s: { schoolId: string; sessionId: string | null; instructorId: string; room: string; studentIds: string[] } & Range,
  timeZone: string,
): Promise<HttpError> {
  const when = (r: { startsAt: Date; endsAt: Date; title: string }) =>
    `"${r.title}" ${formatInZone(new Date(r.startsAt), timeZone, "EEE d MMM HH:mm")}–${formatInZone(new Date(r.endsAt), timeZone, "HH:mm")}`;
  const base = `SELECT s.starts_at AS "startsAt", s.ends_at AS "endsAt", br.title FROM training_sessions s
                  JOIN briefing_revisions br ON br.id = s.briefing_revision_id
                 WHERE s.status = 'scheduled' AND tstzrange(s.starts_at, s.ends_at, '[)') && tstzrange(:a, :b, '[)')
                   AND (:self::uuid IS NULL OR s.id <> :self::uuid)`;
  const rep = { a: s.startsAt, b: s.endsAt, self: s.sessionId, i: s.instructorId, room: s.room, school: s.schoolId };
  if (constraint === "training_sessions_instructor_busy") {
    const [hit] = await sequelize.query<{ startsAt: Date; endsAt: Date; title: string }>(`${base} AND s.instructor_id = :i LIMIT 1`, {
      replacements: rep,
      type: QueryTypes.SELECT,
      transaction: t,
    });
    const [p] = await sequelize.query<{ name: string }>(`SELECT name FROM people WHERE id = :i`, {
      replacements: rep,
      type: QueryTypes.SELECT,
      transaction: t,
    });
    return new HttpError(
      409,
      `instructorId: ${p?.name ?? "the instructor"} already teaches ${hit ? when(hit) : "at that time"}`,
      "instructorId",
    );
  }
  if (constraint === "training_sessions_room_busy") {
    const [hit] = await sequelize.query<{ startsAt: Date; endsAt: Date; title: string }>(
      `${base} AND s.school_id = :school AND lower(btrim(s.room)) = lower(btrim(:room)) LIMIT 1`,
      { replacements: rep, type: QueryTypes.SELECT, transaction: t },
    );
    return new HttpError(409, `room: ${s.room} is already booked for ${hit ? when(hit) : "that time"}`, "room");
  }
  if (constraint === "session_attendees_student_busy") {
    const [hit] = await sequelize.query<{ startsAt: Date; endsAt: Date; title: string; name: string }>(
      `SELECT s.starts_at AS "startsAt", s.ends_at AS "endsAt", br.title, p.name FROM session_attendees a
         JOIN training_sessions s ON s.id = a.session_id JOIN briefing_revisions br ON br.id = s.briefing_revision_id
         JOIN people p ON p.id = a.student_id
        WHERE a.status = 'scheduled' AND a.student_id = ANY(ARRAY[:students]::uuid[])
          AND tstzrange(a.starts_at, a.ends_at, '[)') && tstzrange(:a, :b, '[)') AND (:self::uuid IS NULL OR a.session_id <> :self::uuid)
        ORDER BY p.name LIMIT 1`,
      {
        replacements: { ...rep, students: s.studentIds.length ? s.studentIds : ["00000000-0000-0000-0000-000000000000"] },
        type: QueryTypes.SELECT,
        transaction: t,
      },
    );
    return new HttpError(
      409,
      `students: ${hit ? `${hit.name} is already in ${when(hit)}` : "a student is already in another session then"}`,
      "studentIds",
    );
  }
  return new HttpError(409, "The session overlaps another one", "date");
}

/** Runs `fn` in a savepoint; an exclusion refusal comes back as a 409 naming what is busy. */
async function guardOverlap<T>(
  t: Transaction,
  ctx: { schoolId: string; sessionId: string | null; instructorId: string; room: string; studentIds: string[] } & Range,
  timeZone: string,
  fn: (sp: Transaction) => Promise<T>,
): Promise<T> {
  try {
    return await sequelize.transaction({ transaction: t }, fn);
  } catch (e) {
    const pe = pgError(e);
    if (pe?.code === "23P01") throw await conflictError(t, pe.constraint, ctx, timeZone);
    throw e;
  }
}

async function requireInstructor(schoolId: string, personId: string, t: Transaction) {
  const [p] = await sequelize.query<{ id: string; name: string }>(
    `SELECT id, name FROM people WHERE id = :id AND school_id = :s AND active AND roles && ARRAY['instructor','chief']::text[]`,
    { replacements: { id: personId, s: schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!p) throw new HttpError(404, "instructorId: no such instructor at this school", "instructorId");
  return p;
}

/** The students a session takes: members of the cohort on the session's date, plus those named. */
async function attendeesFor(schoolId: string, cohortId: string, studentIds: string[], onDate: string, t: Transaction) {
  const out = new Map<string, "cohort" | "individual">();
  if (cohortId) {
    const members = await sequelize.query<{ id: string }>(
      `SELECT m.student_id AS id FROM cohort_memberships m JOIN cohorts c ON c.id = m.cohort_id JOIN people p ON p.id = m.student_id
        WHERE c.id = :c AND c.school_id = :s AND p.active AND m.from_date <= :d AND (m.to_date IS NULL OR m.to_date > :d)`,
      { replacements: { c: cohortId, s: schoolId, d: onDate }, type: QueryTypes.SELECT, transaction: t },
    );
    for (const m of members) out.set(m.id, "cohort");
  }
  if (studentIds.length) {
    const found = await sequelize.query<{ id: string }>(
      `SELECT id FROM people WHERE id = ANY(ARRAY[:ids]::uuid[]) AND school_id = :s AND active AND 'student' = ANY(roles)`,
      { replacements: { ids: studentIds, s: schoolId }, type: QueryTypes.SELECT, transaction: t },
    );
    if (found.length !== new Set(studentIds).size)
      throw new HttpError(404, "studentIds: a chosen student is not a student of this school", "studentIds");
    for (const f of found) if (!out.has(f.id)) out.set(f.id, "individual");
  }
  return out;
}

export interface ScheduledSession {
  id: string;
  startsAt: Date;
  endsAt: Date;
  sequence: number;
  attendeeCount: number;
}

/**
 * Schedules a session of a briefing's current revision. The wall-clock date and time are read in
 * the school's time zone; the end is start + duration in real minutes. The database refuses any
 * double-booking of the instructor, the room or a student.
 */
export async function scheduleSession(
  user: CurrentUser,
  input: z.output<typeof scheduleSessionSchema>,
  t: Transaction,
): Promise<ScheduledSession> {
  const school = await schoolInTx(user.schoolId, t);
  const [briefing] = await sequelize.query<{ id: string; revisionId: string | null; courseId: string }>(
    `SELECT id, current_revision_id AS "revisionId", course_id AS "courseId" FROM briefings WHERE id = :id AND school_id = :s`,
    { replacements: { id: input.briefingId, s: user.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!briefing?.revisionId) throw new HttpError(404, "briefingId: no such briefing at this school", "briefingId");
  await requireInstructor(user.schoolId, input.instructorId, t);
  if (input.cohortId) {
    const [c] = await sequelize.query<{ id: string }>(`SELECT id FROM cohorts WHERE id = :c AND school_id = :s`, {
      replacements: { c: input.cohortId, s: user.schoolId },
      type: QueryTypes.SELECT,
      transaction: t,
    });
    if (!c) throw new HttpError(404, "cohortId: no such cohort at this school", "cohortId");
  }
  const startsAt = zonedInstant(input.date, input.time, school.timeZone);
  const endsAt = new Date(startsAt.getTime() + input.durationMinutes * 60_000);
  const attendees = await attendeesFor(user.schoolId, input.cohortId, input.studentIds, input.date, t);
  if (attendees.size === 0) throw new HttpError(422, "cohortId: the cohort has no students on that date", "cohortId");
  const ctx = {
    schoolId: user.schoolId,
    sessionId: null,
    instructorId: input.instructorId,
    room: input.room,
    studentIds: [...attendees.keys()],
    startsAt,
    endsAt,
  };
  const id = await guardOverlap(t, ctx, school.timeZone, async (sp) => {
    const [row] = await sequelize.query<{ id: string }>(
      `INSERT INTO training_sessions (school_id, briefing_id, briefing_revision_id, starts_at, ends_at, room, instructor_id, cohort_id, created_by)
       VALUES (:s, :b, :r, :a, :e, :room, :i, :c, :by) RETURNING id`,
      {
        replacements: {
          s: user.schoolId,
          b: briefing.id,
          r: briefing.revisionId,
          a: startsAt,
          e: endsAt,
          room: input.room.trim(),
          i: input.instructorId,
          c: input.cohortId || null,
          by: user.id,
        },
        type: QueryTypes.SELECT,
        transaction: sp,
      },
    );
    const sessionId = row!.id;
    const ids = [...attendees.keys()];
    await sequelize.query(
      `INSERT INTO session_attendees (session_id, student_id, via, starts_at, ends_at, status)
       SELECT :sid, x.id, x.via, :a, :e, 'scheduled' FROM unnest(ARRAY[:ids]::uuid[], ARRAY[:vias]::text[]) AS x(id, via)`,
      { replacements: { sid: sessionId, ids, vias: ids.map((i) => attendees.get(i)!), a: startsAt, e: endsAt }, transaction: sp },
    );
    return sessionId;
  });
  return { id, startsAt, endsAt, sequence: 0, attendeeCount: attendees.size };
}

interface LockedSession {
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

async function lockSessionForChange(user: CurrentUser, sessionId: string, t: Transaction): Promise<LockedSession> {
  const [s] = await sequelize.query<LockedSession>(
    `SELECT s.id, s.school_id AS "schoolId", s.instructor_id AS "instructorId", c.lead_instructor_id AS "cohortLeadId",
            s.starts_at AS "startsAt", s.ends_at AS "endsAt", s.room, s.status, s.sequence, br.title, p.name AS "instructorName"
       FROM training_sessions s JOIN briefing_revisions br ON br.id = s.briefing_revision_id
       JOIN people p ON p.id = s.instructor_id LEFT JOIN cohorts c ON c.id = s.cohort_id
      WHERE s.id = :id AND s.school_id = :school FOR UPDATE OF s`,
    { replacements: { id: sessionId, school: user.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!s) throw new HttpError(404, "sessionId: no such session", "sessionId");
  if (!isChief(user) && s.instructorId !== user.id && s.cohortLeadId !== user.id) {
    throw new HttpError(
      403,
      "sessionId: only the session's instructor, the cohort's lead instructor or the chief instructor may change it",
      "sessionId",
    );
  }
  return s;
}

async function attendeesToTell(sessionId: string, t: Transaction) {
  return sequelize.query<{ id: string; name: string; email: string }>(
    `SELECT p.id, p.name, p.email FROM session_attendees a JOIN people p ON p.id = a.student_id WHERE a.session_id = :id AND p.active ORDER BY p.name`,
    { replacements: { id: sessionId }, type: QueryTypes.SELECT, transaction: t },
  );
}

/**
 * Moves a session (time, length, room, instructor). Its sequence grows, and each attendee is told
 * through the outbox in the same transaction; the mail's key carries the new sequence.
 */
export async function rescheduleSession(user: CurrentUser, input: z.output<typeof rescheduleSessionSchema>, t: Transaction) {
  const school = await schoolInTx(user.schoolId, t);
  const s = await lockSessionForChange(user, input.sessionId, t);
  if (s.status !== "scheduled") throw new HttpError(409, "sessionId: a cancelled session cannot be moved; schedule a new one", "sessionId");
  const [recorded] = await sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM ground_log_entries WHERE session_id = :id`, {
    replacements: { id: s.id },
    type: QueryTypes.SELECT,
    transaction: t,
  });
  if ((recorded?.n ?? 0) > 0)
    throw new HttpError(409, "sessionId: attendance is already recorded for this session; it cannot be moved", "sessionId");
  const instructor = await requireInstructor(user.schoolId, input.instructorId, t);
  const startsAt = zonedInstant(input.date, input.time, school.timeZone);
  const endsAt = new Date(startsAt.getTime() + input.durationMinutes * 60_000);
  const attendees = await attendeesToTell(s.id, t);
  const ctx = {
    schoolId: user.schoolId,
    sessionId: s.id,
    instructorId: input.instructorId,
    room: input.room,
    studentIds: attendees.map((a) => a.id),
    startsAt,
    endsAt,
  };
  const sequence = await guardOverlap(t, ctx, school.timeZone, async (sp) => {
    const [row] = await sequelize.query<{ sequence: number }>(
      `UPDATE training_sessions SET starts_at = :a, ends_at = :e, room = :room, instructor_id = :i, sequence = sequence + 1, updated_at = now()
        WHERE id = :id RETURNING sequence`,
      {
        replacements: { a: startsAt, e: endsAt, room: input.room.trim(), i: input.instructorId, id: s.id },
        type: QueryTypes.SELECT,
        transaction: sp,
      },
    );
    return row!.sequence;
  });
  const mailSchool = school;
  for (const a of attendees) {
    const mail = composeMail(
      "session.rescheduled",
      {
        name: a.name,
        briefingTitle: s.title,
        previousStartsAt: new Date(s.startsAt),
        startsAt,
        endsAt,
        room: input.room.trim(),
        instructorName: instructor.name,
      },
      mailSchool,
    );
    await enqueueMail(t, {
      schoolId: user.schoolId,
      kind: "session.rescheduled",
      idempotencyKey: `session.rescheduled:${s.id}:${sequence}:${a.id}`,
      recipientId: a.id,
      to: a.email,
      ...mail,
    });
  }
  return { id: s.id, sequence, startsAt, endsAt, told: attendees.length };
}

/** Cancels a session with a reason; it stays (and stays in calendar feeds) as cancelled, and blocks nothing. */
export async function cancelSession(user: CurrentUser, input: z.output<typeof cancelSessionSchema>, t: Transaction) {
  const school = await schoolInTx(user.schoolId, t);
  const s = await lockSessionForChange(user, input.sessionId, t);
  if (s.status !== "scheduled") throw new HttpError(409, "sessionId: the session is already cancelled", "sessionId");
  const [recorded] = await sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM ground_log_entries WHERE session_id = :id`, {
    replacements: { id: s.id },
    type: QueryTypes.SELECT,
    transaction: t,
  });
  if ((recorded?.n ?? 0) > 0)
    throw new HttpError(409, "sessionId: attendance is already recorded for this session; it cannot be cancelled", "sessionId");
  const [row] = await sequelize.query<{ sequence: number }>(
    `UPDATE training_sessions SET status = 'cancelled', cancel_reason = :r, sequence = sequence + 1, updated_at = now() WHERE id = :id RETURNING sequence`,
    { replacements: { r: input.reason, id: s.id }, type: QueryTypes.SELECT, transaction: t },
  );
  const sequence = row!.sequence;
  // make-up items planned into this session go back to open
  await sequelize.query(
    `UPDATE makeup_items SET state = 'open', scheduled_session_id = NULL WHERE scheduled_session_id = :id AND state = 'scheduled'`,
    {
      replacements: { id: s.id },
      transaction: t,
    },
  );
  const attendees = await attendeesToTell(s.id, t);
  const mailSchool = school;
  for (const a of attendees) {
    const mail = composeMail(
      "session.cancelled",
      { name: a.name, briefingTitle: s.title, startsAt: new Date(s.startsAt), room: s.room, reason: input.reason },
      mailSchool,
    );
    await enqueueMail(t, {
      schoolId: user.schoolId,
      kind: "session.cancelled",
      idempotencyKey: `session.cancelled:${s.id}:${sequence}:${a.id}`,
      recipientId: a.id,
      to: a.email,
      ...mail,
    });
  }
  return { id: s.id, sequence, told: attendees.length };
}

// ---------------------------------------------------------------- reading

export interface SessionRow {
  id: string;
  briefingId: string;
  briefingTitle: string;
  revisionNumber: number;
  startsAt: string;
  endsAt: string;
  /** wall-clock date and times in the school's time zone */
  date: string;
  startLocal: string;
  endLocal: string;
  durationMinutes: number;
  room: string;
  instructorId: string;
  instructorName: string;
  cohortId: string | null;
  cohortName: string | null;
  status: "scheduled" | "cancelled";
  sequence: number;
  cancelReason: string | null;
  attendeeCount: number;
  recordedCount: number;
}

export type SessionFilter = Partial<Pick<SessionsQuery, "instructor" | "cohort" | "room" | "mine">> & {
  status?: SessionsQuery["status"];
  fromInstant?: Date;
  toInstant?: Date;
};

const SORT_SQL: Record<SessionsQuery["sort"], string> = {
  starts_at: "s.starts_at",
  briefing: "br.title",
  room: "lower(s.room)",
  instructor: "ip.name",
  cohort: "c.name",
};

/**
 * Sessions the caller may see: a student, those they attend; instructors and the chief, the
 * school's (with `mine` for their own); a sponsor or anyone else, none.
 */
export async function listSessions(
  user: CurrentUser,
  filter: SessionFilter,
  paging: { sort?: SessionsQuery["sort"]; dir?: "asc" | "desc"; page?: number; pageSize?: number } = {},
): Promise<{ rows: SessionRow[]; total: number }> {
  const staff = user.roles.includes("chief") || user.roles.includes("instructor");
  const student = user.roles.includes("student");
  if (!staff && !student) return { rows: [], total: 0 };
  const school = await getSchool(user.schoolId);
  const where = [`s.school_id = :school`];
  const rep: Record<string, unknown> = { school: user.schoolId, uid: user.id };
  if (!staff) where.push(`EXISTS (SELECT 1 FROM session_attendees a WHERE a.session_id = s.id AND a.student_id = :uid)`);
  if (filter.mine === "1")
    where.push(`(s.instructor_id = :uid OR EXISTS (SELECT 1 FROM session_attendees a WHERE a.session_id = s.id AND a.student_id = :uid))`);
  if (filter.instructor) {
    where.push(`s.instructor_id = :instructor`);
    rep.instructor = filter.instructor;
  }
  if (filter.cohort) {
    where.push(`s.cohort_id = :cohort`);
    rep.cohort = filter.cohort;
  }
  if (filter.room) {
    where.push(`lower(btrim(s.room)) = lower(btrim(:room))`);
    rep.room = filter.room;
  }
  if (filter.status && filter.status !== "all") {
    where.push(`s.status = :status`);
    rep.status = filter.status;
  }
  if (filter.fromInstant) {
    where.push(`s.ends_at > :from`);
    rep.from = filter.fromInstant;
  }
  if (filter.toInstant) {
    where.push(`s.starts_at < :to`);
    rep.to = filter.toInstant;
  }
  const pageSize = paging.pageSize ?? 500;
  const page = paging.page ?? 1;
  const order = `${SORT_SQL[paging.sort ?? "starts_at"]} ${paging.dir === "desc" ? "DESC" : "ASC"}, s.starts_at ASC, s.id`;
  const from = `FROM training_sessions s JOIN briefing_revisions br ON br.id = s.briefing_revision_id
                JOIN people ip ON ip.id = s.instructor_id LEFT JOIN cohorts c ON c.id = s.cohort_id
               WHERE ${where.join(" AND ")}`;
  const [count] = await sequelize.query<{ n: number }>(`SELECT count(*)::int AS n ${from}`, { replacements: rep, type: QueryTypes.SELECT });
  const raw = await sequelize.query<
    Omit<SessionRow, "date" | "startLocal" | "endLocal" | "startsAt" | "endsAt"> & { startsAt: Date; endsAt: Date }
  >(
    `SELECT s.id, s.briefing_id AS "briefingId", br.title AS "briefingTitle", br.number AS "revisionNumber",
            s.starts_at AS "startsAt", s.ends_at AS "endsAt", (extract(epoch FROM s.ends_at - s.starts_at) / 60)::int AS "durationMinutes",
            s.room, s.instructor_id AS "instructorId", ip.name AS "instructorName", s.cohort_id AS "cohortId", c.name AS "cohortName",
            s.status, s.sequence, s.cancel_reason AS "cancelReason",
            (SELECT count(*)::int FROM session_attendees a WHERE a.session_id = s.id) AS "attendeeCount",
            (SELECT count(DISTINCT g.student_id)::int FROM ground_log_entries g WHERE g.session_id = s.id) AS "recordedCount"
       ${from} ORDER BY ${order} LIMIT :limit OFFSET :offset`,
    { replacements: { ...rep, limit: pageSize, offset: (page - 1) * pageSize }, type: QueryTypes.SELECT },
  );
  const tz = school.timeZone;
  const rows = raw.map((r) => {
    const a = new Date(r.startsAt);
    const e = new Date(r.endsAt);
    return {
      ...r,
      startsAt: a.toISOString(),
      endsAt: e.toISOString(),
      date: dateInZone(a, tz),
      startLocal: formatInZone(a, tz, "HH:mm"),
      endLocal: formatInZone(e, tz, "HH:mm"),
    };
  });
  return { rows, total: count?.n ?? 0 };
}

export interface SessionDetail extends SessionRow {
  objective: string;
  syllabusItems: { id: string; code: string; title: string }[];
  attendees: { studentId: string; name: string; via: "cohort" | "individual" }[];
  canChange: boolean;
  ended: boolean;
}

/** One session, if the caller may see it (a student only one they attend). */
export async function getSession(user: CurrentUser, sessionId: string): Promise<SessionDetail | null> {
  const staff = user.roles.includes("chief") || user.roles.includes("instructor");
  const school = await getSchool(user.schoolId);
  const [r] = await sequelize.query<
    Omit<SessionRow, "date" | "startLocal" | "endLocal" | "startsAt" | "endsAt"> & {
      startsAt: Date;
      endsAt: Date;
      objective: string;
      cohortLeadId: string | null;
    }
  >(
    `SELECT s.id, s.briefing_id AS "briefingId", br.title AS "briefingTitle", br.number AS "revisionNumber", br.objective,
            s.starts_at AS "startsAt", s.ends_at AS "endsAt", (extract(epoch FROM s.ends_at - s.starts_at) / 60)::int AS "durationMinutes",
            s.room, s.instructor_id AS "instructorId", ip.name AS "instructorName", s.cohort_id AS "cohortId", c.name AS "cohortName",
            c.lead_instructor_id AS "cohortLeadId", s.status, s.sequence, s.cancel_reason AS "cancelReason",
            (SELECT count(*)::int FROM session_attendees a WHERE a.session_id = s.id) AS "attendeeCount",
            (SELECT count(DISTINCT g.student_id)::int FROM ground_log_entries g WHERE g.session_id = s.id) AS "recordedCount"
       FROM training_sessions s JOIN briefing_revisions br ON br.id = s.briefing_revision_id
       JOIN people ip ON ip.id = s.instructor_id LEFT JOIN cohorts c ON c.id = s.cohort_id
      WHERE s.id = :id AND s.school_id = :school
        AND (:staff OR EXISTS (SELECT 1 FROM session_attendees a WHERE a.session_id = s.id AND a.student_id = :uid))`,
    { replacements: { id: sessionId, school: user.schoolId, staff, uid: user.id }, type: QueryTypes.SELECT },
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
    canChange: staff && (isChief(user) || r.instructorId === user.id || cohortLeadId === user.id),
    ended: e.getTime() <= now().getTime(),
  };
}

/** Sessions that ended more than 24 h ago with nobody's attendance recorded, that the instructor teaches. */
export async function sessionsAwaitingAttendance(user: CurrentUser): Promise<SessionRow[]> {
  const cutoff = new Date(now().getTime() - 24 * 3600_000);
  const { rows } = await listSessions(
    user,
    { status: "scheduled", toInstant: cutoff, instructor: user.id },
    { sort: "starts_at", dir: "desc", pageSize: 50 },
  );
  return rows.filter((r) => new Date(r.endsAt).getTime() <= cutoff.getTime() && r.recordedCount === 0 && r.attendeeCount > 0);
}

// ---------------------------------------------------------------- form choices

export async function schedulingChoices(user: CurrentUser, db: Db = {}) {
  const rep = { replacements: { s: user.schoolId }, type: QueryTypes.SELECT as const, transaction: db.transaction };
  const [briefings, instructors, cohorts, students, rooms] = await Promise.all([
    sequelize.query<{ id: string; title: string; revisionNumber: number; minutes: number }>(
      `SELECT b.id, br.title, br.number AS "revisionNumber",
              COALESCE((SELECT sum((el->>'minutes')::int) FROM jsonb_array_elements(br.elements) el), 0)::int AS minutes
         FROM briefings b JOIN briefing_revisions br ON br.id = b.current_revision_id WHERE b.school_id = :s ORDER BY br.title`,
      rep,
    ),
    sequelize.query<{ id: string; name: string }>(
      `SELECT id, name FROM people WHERE school_id = :s AND active AND roles && ARRAY['instructor','chief']::text[] ORDER BY name`,
      rep,
    ),
    sequelize.query<{ id: string; name: string }>(`SELECT id, name FROM cohorts WHERE school_id = :s ORDER BY starts_on, name`, rep),
    sequelize.query<{ id: string; name: string }>(
      `SELECT id, name FROM people WHERE school_id = :s AND active AND 'student' = ANY(roles) ORDER BY name`,
      rep,
    ),
    sequelize.query<{ room: string }>(
      `SELECT DISTINCT ON (lower(btrim(room))) btrim(room) AS room FROM training_sessions WHERE school_id = :s ORDER BY lower(btrim(room))`,
      rep,
    ),
  ]);
  return { briefings, instructors, cohorts, students, rooms: rooms.map((r) => r.room) };
}

// ---------------------------------------------------------------- personal iCalendar feed

const FEED_TOKEN = /^[A-Za-z0-9_-]{43}$/;
const feedHash = (token: string) => createHash("sha256").update(token).digest("hex");

/** Makes (or replaces) the caller's secret feed token; the old one stops working at once. Only its hash is kept. */
export async function resetCalendarToken(user: CurrentUser, t: Transaction): Promise<{ token: string; path: string }> {
  const token = randomBytes(32).toString("base64url");
  await sequelize.query(
    `INSERT INTO calendar_feeds (person_id, token_hash, created_at) VALUES (:p, :h, :now)
     ON CONFLICT (person_id) DO UPDATE SET token_hash = EXCLUDED.token_hash, created_at = EXCLUDED.created_at`,
    { replacements: { p: user.id, h: feedHash(token), now: now() }, transaction: t },
  );
  return { token, path: `/api/calendar/${token}.ics` };
}

export async function calendarFeedCreatedAt(personId: string): Promise<Date | null> {
  const [r] = await sequelize.query<{ createdAt: Date }>(`SELECT created_at AS "createdAt" FROM calendar_feeds WHERE person_id = :p`, {
    replacements: { p: personId },
    type: QueryTypes.SELECT,
  });
  return r ? new Date(r.createdAt) : null;
}

/**
 * The iCalendar text of a feed token, or null for an unknown (or replaced) token. Holds the
 * sessions the person teaches or attends, from 60 days back, cancelled ones included with
 * STATUS:CANCELLED; each event's UID is the session's id and its SEQUENCE the session's sequence.
 */
export async function calendarFeed(token: string): Promise<string | null> {
  if (!FEED_TOKEN.test(token)) return null;
  const [person] = await sequelize.query<{ id: string; name: string; schoolId: string; active: boolean }>(
    `SELECT p.id, p.name, p.school_id AS "schoolId", p.active FROM calendar_feeds f JOIN people p ON p.id = f.person_id WHERE f.token_hash = :h`,
    { replacements: { h: feedHash(token) }, type: QueryTypes.SELECT },
  );
  if (!person || !person.active) return null;
  const school = await getSchool(person.schoolId);
  const since = new Date(now().getTime() - 60 * 24 * 3600_000);
  const rows = await sequelize.query<{
    id: string;
    title: string;
    objective: string;
    startsAt: Date;
    endsAt: Date;
    room: string;
    instructorName: string;
    status: string;
    sequence: number;
    cancelReason: string | null;
    updatedAt: Date;
  }>(
    `SELECT s.id, br.title, br.objective, s.starts_at AS "startsAt", s.ends_at AS "endsAt", s.room, ip.name AS "instructorName",
            s.status, s.sequence, s.cancel_reason AS "cancelReason", s.updated_at AS "updatedAt"
       FROM training_sessions s JOIN briefing_revisions br ON br.id = s.briefing_revision_id JOIN people ip ON ip.id = s.instructor_id
      WHERE s.school_id = :school AND s.ends_at > :since
        AND (s.instructor_id = :p OR EXISTS (SELECT 1 FROM session_attendees a WHERE a.session_id = s.id AND a.student_id = :p))
      ORDER BY s.starts_at`,
    { replacements: { school: person.schoolId, since, p: person.id }, type: QueryTypes.SELECT },
  );
  const cal = ical({ name: `${school.name}: Timetable`, prodId: { company: "Chalkwing", product: "Timetable", language: "EN" } });
  for (const r of rows) {
    cal.createEvent({
      id: `${r.id}@sessions.chalkwing.test`,
      start: new Date(r.startsAt),
      end: new Date(r.endsAt),
      stamp: new Date(r.updatedAt),
      summary: r.status === "cancelled" ? `Cancelled: ${r.title}` : r.title,
      location: r.room,
      description: [`Instructor: ${r.instructorName}`, r.objective, r.cancelReason ? `Cancelled: ${r.cancelReason}` : ""]
        .filter(Boolean)
        .join("\n\n"),
      sequence: r.sequence,
      status: r.status === "cancelled" ? ICalEventStatus.CANCELLED : ICalEventStatus.CONFIRMED,
    });
  }
  return cal.toString();
}
