import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { enqueueMail, pendingNoticeFacts } from "../mail/outbox";
import { guardOverlap } from "./overlap-guard";
import { resolveRoom } from "../rooms/resolve-room";
import { lockSessionForChange, assertNoAttendanceRecorded } from "./lock-session";
import { attendeesToTell, requireInstructor } from "./session-people";
import { mailSchool } from "./mail-school";
import { composeMail } from "@/lib/mail/compose";
import { HttpError } from "@/lib/http/errors";
import { zonedInstant } from "@/lib/time";
import type { CurrentUser } from "@/lib/auth/session";
import type { RescheduleSessionOutput } from "@/lib/timetable/schema";

/** The coalesce key of change notices about one session for one person (moves, then a cancellation). */
export function sessionChangeKey(sessionId: string, personId: string): string {
  return `session.changed:${sessionId}:${personId}`;
}

/**
 * When each person last heard the session starts: the "was" time of an unsent change notice about
 * it (which the new notice replaces), else the start they were told of, `startsAt`.
 */
export async function lastHeardStart(
  t: Transaction,
  sessionId: string,
  personIds: string[],
  startsAt: Date | string,
): Promise<(personId: string) => Date> {
  const pending = await pendingNoticeFacts(
    t,
    personIds.map((id) => sessionChangeKey(sessionId, id)),
  );
  return (personId) => {
    const heard = pending.get(sessionChangeKey(sessionId, personId))?.heardStartsAt;
    return typeof heard === "string" ? new Date(heard) : new Date(startsAt);
  };
}

/**
 * Moves a session (time, length, room, instructor). Its sequence grows, and each attendee is told
 * through the outbox in the same transaction; the mail's key carries the new sequence.
 */
export async function rescheduleSession(user: CurrentUser, input: RescheduleSessionOutput, t: Transaction) {
  const school = await mailSchool(user.schoolId, t);
  const s = await lockSessionForChange(user, input.sessionId, t);
  if (s.status !== "scheduled") throw new HttpError(409, "sessionId: a cancelled session cannot be moved; schedule a new one", "sessionId");
  await assertNoAttendanceRecorded(s.id, "moved", t);
  const instructor = await requireInstructor(user.schoolId, input.instructorId, t);
  const room = await resolveRoom(user.schoolId, input, t);
  const startsAt = zonedInstant(input.date, input.time, school.timeZone);
  const endsAt = new Date(startsAt.getTime() + input.durationMinutes * 60_000);
  const attendees = await attendeesToTell(s.id, t);
  const ctx = {
    schoolId: user.schoolId,
    sessionId: s.id,
    instructorId: input.instructorId,
    room,
    studentIds: attendees.map((a) => a.id),
    startsAt,
    endsAt,
  };
  const sequence = await guardOverlap(t, ctx, school.timeZone, async (sp) => {
    const [row] = await sequelize.query<{ sequence: number }>(
      `UPDATE training_sessions SET starts_at = :a, ends_at = :e, room_id = :room, instructor_id = :i, sequence = sequence + 1, updated_at = now()
        WHERE id = :id RETURNING sequence`,
      {
        replacements: { a: startsAt, e: endsAt, room: room.id, i: input.instructorId, id: s.id },
        type: QueryTypes.SELECT,
        transaction: sp,
      },
    );
    return row!.sequence;
  });
  // one notice per burst: an unsent notice about this session is replaced, and the new one says
  // "was" with the time the attendee last heard of
  const heard = await lastHeardStart(
    t,
    s.id,
    attendees.map((a) => a.id),
    s.startsAt,
  );
  for (const a of attendees) {
    const heardStartsAt = heard(a.id);
    const mail = composeMail(
      "session.rescheduled",
      {
        name: a.name,
        briefingTitle: s.title,
        previousStartsAt: heardStartsAt,
        startsAt,
        endsAt,
        room: room.name,
        instructorName: instructor.name,
      },
      school,
    );
    await enqueueMail(t, {
      schoolId: user.schoolId,
      kind: "session.rescheduled",
      idempotencyKey: `session.rescheduled:${s.id}:${sequence}:${a.id}`,
      recipientId: a.id,
      to: a.email,
      ...mail,
      coalesce: { key: sessionChangeKey(s.id, a.id), facts: { heardStartsAt: heardStartsAt.toISOString() } },
    });
  }
  return { id: s.id, sequence, startsAt, endsAt, told: attendees.length };
}
