import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { getSchool } from "../shared/school";
import { guardOverlap } from "./overlap-guard";
import { resolveRoom } from "../rooms/resolve-room";
import { attendeesFor, requireInstructor } from "./session-people";
import { HttpError } from "@/lib/http/errors";
import { zonedInstant } from "@/lib/time";
import type { CurrentUser } from "@/lib/auth/session";
import type { ScheduleSessionOutput } from "@/lib/timetable/schema";
import { capCreates } from "../shared/create-cap";

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
export async function scheduleSession(user: CurrentUser, input: ScheduleSessionOutput, t: Transaction): Promise<ScheduledSession> {
  const school = await getSchool(user.schoolId, t);
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
  const room = await resolveRoom(user.schoolId, input, t);
  const startsAt = zonedInstant(input.date, input.time, school.timeZone);
  const endsAt = new Date(startsAt.getTime() + input.durationMinutes * 60_000);
  const attendees = await attendeesFor(user.schoolId, input.cohortId, input.studentIds, input.date, t);
  if (attendees.size === 0) throw new HttpError(422, "cohortId: the cohort has no students on that date", "cohortId");
  await capCreates(t, user, "sessions");
  const ctx = {
    schoolId: user.schoolId,
    sessionId: null,
    instructorId: input.instructorId,
    room,
    studentIds: [...attendees.keys()],
    startsAt,
    endsAt,
  };
  const id = await guardOverlap(t, ctx, school.timeZone, async (sp) => {
    const [row] = await sequelize.query<{ id: string }>(
      `INSERT INTO training_sessions (school_id, briefing_id, briefing_revision_id, starts_at, ends_at, room_id, instructor_id, cohort_id, created_by)
       VALUES (:s, :b, :r, :a, :e, :room, :i, :c, :by) RETURNING id`,
      {
        replacements: {
          s: user.schoolId,
          b: briefing.id,
          r: briefing.revisionId,
          a: startsAt,
          e: endsAt,
          room: room.id,
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
