import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { DEFAULT_SETTINGS } from "../shared/school";

// Session reminders: which attendees are due one at a clock value, and cancelling the queued
// reminders that a move or a cancellation made wrong. The outbox key is
// `session.reminder:<session>:<sequence>:<person>`.

export interface ReminderCandidate {
  sessionId: string;
  sequence: number;
  schoolId: string;
  startsAt: Date;
  endsAt: Date;
  room: string;
  title: string;
  instructorName: string;
  schoolName: string;
  timeZone: string;
  senderName: string | null;
  personId: string;
  personName: string;
  email: string;
}

/** Cancels queued reminders whose session was moved (another sequence) or is no longer scheduled; returns how many. */
export async function cancelStaleReminders(t: Transaction): Promise<number> {
  const [, count] = await sequelize.query(
    `UPDATE outbox o SET state = 'cancelled', last_error = 'the session was moved or cancelled before this reminder went out'
       FROM training_sessions s
      WHERE o.kind = 'session.reminder' AND o.state = 'queued'
        AND split_part(o.idempotency_key, ':', 2) = s.id::text
        AND (s.status <> 'scheduled' OR split_part(o.idempotency_key, ':', 3) <> s.sequence::text)`,
    { transaction: t },
  );
  return Number(count ?? 0) || 0;
}

/**
 * Each active attendee of each scheduled session that starts after `at` and within the school's
 * reminder lead time of it, who has no reminder for the session's current sequence yet.
 */
export async function dueReminders(at: Date, t: Transaction): Promise<ReminderCandidate[]> {
  return sequelize.query<ReminderCandidate>(
    `SELECT s.id AS "sessionId", s.sequence, s.school_id AS "schoolId", s.starts_at AS "startsAt", s.ends_at AS "endsAt", s.room,
            br.title, ip.name AS "instructorName", sc.name AS "schoolName", sc.time_zone AS "timeZone",
            sc.settings->>'mailSenderName' AS "senderName", p.id AS "personId", p.name AS "personName", p.email
       FROM training_sessions s
       JOIN schools sc ON sc.id = s.school_id
       JOIN briefing_revisions br ON br.id = s.briefing_revision_id
       JOIN people ip ON ip.id = s.instructor_id
       JOIN session_attendees a ON a.session_id = s.id
       JOIN people p ON p.id = a.student_id AND p.active
      WHERE s.status = 'scheduled'
        AND s.starts_at > :at
        AND s.starts_at - COALESCE((sc.settings->>'reminderLeadHours')::numeric, :lead) * interval '1 hour' <= :at
        AND NOT EXISTS (SELECT 1 FROM outbox o WHERE o.idempotency_key = 'session.reminder:' || s.id || ':' || s.sequence || ':' || p.id)
      ORDER BY s.starts_at, p.name`,
    { replacements: { at, lead: DEFAULT_SETTINGS.reminderLeadHours }, type: QueryTypes.SELECT, transaction: t },
  );
}
