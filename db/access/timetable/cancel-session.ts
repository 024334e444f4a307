import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { enqueueMail } from "../mail/outbox";
import { lastHeardStart, sessionChangeKey } from "./reschedule-session";
import { lockSessionForChange, assertNoAttendanceRecorded } from "./lock-session";
import { attendeesToTell } from "./session-people";
import { mailSchool } from "./mail-school";
import { composeMail } from "@/lib/mail/compose";
import { HttpError } from "@/lib/http/errors";
import type { CurrentUser } from "@/lib/auth/session";
import type { CancelSessionOutput } from "@/lib/timetable/schema";

/** Cancels a session with a reason; it stays (and stays in calendar feeds) as cancelled, and blocks nothing. */
export async function cancelSession(user: CurrentUser, input: CancelSessionOutput, t: Transaction) {
  const school = await mailSchool(user.schoolId, t);
  const s = await lockSessionForChange(user, input.sessionId, t);
  if (s.status !== "scheduled") throw new HttpError(409, "sessionId: the session is already cancelled", "sessionId");
  await assertNoAttendanceRecorded(s.id, "cancelled", t);
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
  // an unsent move notice is replaced by this one, which names the time the attendee last heard of
  const heard = await lastHeardStart(
    t,
    s.id,
    attendees.map((a) => a.id),
    s.startsAt,
  );
  for (const a of attendees) {
    const heardStartsAt = heard(a.id);
    const mail = composeMail(
      "session.cancelled",
      { name: a.name, briefingTitle: s.title, startsAt: heardStartsAt, room: s.room, reason: input.reason },
      school,
    );
    await enqueueMail(t, {
      schoolId: user.schoolId,
      kind: "session.cancelled",
      idempotencyKey: `session.cancelled:${s.id}:${sequence}:${a.id}`,
      recipientId: a.id,
      to: a.email,
      ...mail,
      // a cancellation is final: it goes at once, and replaces any move notice not yet sent
      coalesce: { key: sessionChangeKey(s.id, a.id), settleMs: 0 },
    });
  }
  return { id: s.id, sequence, told: attendees.length };
}
