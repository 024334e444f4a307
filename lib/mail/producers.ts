import "server-only";
import { inTransaction } from "@/db/access/mail/connection";
import { enqueueMail } from "@/db/access/mail/outbox";
import { overdueAssignments } from "@/db/access/mail/overdue";
import { cancelStaleReminders, dueReminders } from "@/db/access/mail/session-reminders";
import { weeklyLetterData } from "@/db/access/mail/weekly-letter-data";
import { letterSchools, weeklyLetterRecipients } from "@/db/access/mail/weekly-letter-recipients";
import { DEFAULT_SETTINGS } from "@/db/access/shared/school";
import { appLink, composeMail } from "./compose";
import { composeWeeklyLetter } from "./letter";
import { letterWeek } from "./letter-week";
import { signUnsubscribe } from "./unsubscribe-token";

/**
 * The mail the worker writes itself, decided by the clock value it is given: session reminders,
 * overdue-assignment reminders and the Weekly letter. Each is idempotent (its outbox key names
 * what it is about and its revision), so running it twice, or from two workers, writes each mail
 * once. What is due is read by `db/access/mail/*`; this file composes and enqueues.
 */

export { LETTER_HOUR, letterWeek } from "./letter-week";
export { OVERDUE_LOOKBACK_DAYS } from "@/db/access/mail/overdue";

// ------------------------------------------------------------------ session reminders

/**
 * One reminder per attendee when `now` is within the school's lead time before a scheduled
 * session. The key carries the session's `sequence`, so a moved session gets exactly one new
 * reminder; a queued reminder for an earlier sequence (or a cancelled session) is cancelled.
 */
export async function produceSessionReminders(at: Date): Promise<{ written: number; cancelled: number }> {
  return inTransaction(async (t) => {
    const cancelled = await cancelStaleReminders(t);
    let written = 0;
    for (const r of await dueReminders(at, t)) {
      const school = { name: r.schoolName, timeZone: r.timeZone, senderName: r.senderName ?? undefined };
      const mail = composeMail(
        "session.reminder",
        {
          name: r.personName,
          briefingTitle: r.title,
          startsAt: r.startsAt,
          endsAt: r.endsAt,
          room: r.room,
          instructorName: r.instructorName,
        },
        school,
      );
      const ok = await enqueueMail(t, {
        schoolId: r.schoolId,
        kind: "session.reminder",
        idempotencyKey: `session.reminder:${r.sessionId}:${r.sequence}:${r.personId}`,
        recipientId: r.personId,
        to: r.email,
        dueAt: at,
        ...mail,
      });
      if (ok) written++;
    }
    return { written, cancelled };
  });
}

// ------------------------------------------------------------------ overdue assignments

/** One reminder per student and assignment once its due date has passed (school's calendar) without being marked done. */
export async function produceOverdueReminders(at: Date): Promise<number> {
  return inTransaction(async (t) => {
    let written = 0;
    for (const r of await overdueAssignments(at, t)) {
      const mail = composeMail(
        "assignment.overdue",
        {
          name: r.name,
          title: r.title ?? (r.kind === "demo" ? "Assigned demo" : "Assigned briefing"),
          assignmentKind: r.kind,
          dueOn: r.dueOn,
          path: `/assignments#a-${r.assignmentId}`,
        },
        { name: r.schoolName, timeZone: r.timeZone, senderName: r.senderName ?? undefined },
      );
      const ok = await enqueueMail(t, {
        schoolId: r.schoolId,
        kind: "assignment.overdue",
        idempotencyKey: `assignment.overdue:${r.assignmentId}:${r.studentId}:${r.dueOn}`,
        recipientId: r.studentId,
        to: r.email,
        dueAt: at,
        ...mail,
      });
      if (ok) written++;
    }
    return written;
  });
}

// ------------------------------------------------------------------ the Weekly letter

export function unsubscribeLinks(sponsorId: string, studentId: string) {
  const token = signUnsubscribe({ sponsorId, studentId, kind: "weekly.letter" });
  return { unsubscribeUrl: appLink(`/unsubscribe/${token}`), oneClickUrl: appLink(`/api/unsubscribe?token=${encodeURIComponent(token)}`) };
}

/** The Weekly letter to each sponsor who agreed to it, once per week, from the school's letter day on. */
export async function produceWeeklyLetters(at: Date): Promise<number> {
  let written = 0;
  for (const school of await letterSchools()) {
    const { weekStart, due } = letterWeek(at, school.timeZone, school.settings.weeklyLetterDay ?? DEFAULT_SETTINGS.weeklyLetterDay);
    if (!due) continue;
    for (const link of await weeklyLetterRecipients(school.id, weekStart)) {
      const wrote = await inTransaction(async (t) => {
        const data = await weeklyLetterData(link, school, weekStart, at, t);
        const mail = composeWeeklyLetter(
          { ...data, ...unsubscribeLinks(link.sponsorId, link.studentId) },
          { name: school.name, timeZone: school.timeZone, senderName: school.settings.mailSenderName },
        );
        return enqueueMail(t, {
          schoolId: school.id,
          kind: "weekly.letter",
          idempotencyKey: `weekly.letter:${link.sponsorId}:${link.studentId}:${weekStart}`,
          recipientId: link.sponsorId,
          to: link.sponsorEmail,
          dueAt: at,
          ...mail,
        });
      });
      if (wrote) written++;
    }
  }
  return written;
}

// ------------------------------------------------------------------ everything due

export interface DueWorkResult {
  reminders: number;
  remindersCancelled: number;
  overdue: number;
  letters: number;
  total: number;
}

/** Runs every producer for the given instant; callable from tests with any clock value. */
export async function runDueWork(at: Date): Promise<DueWorkResult> {
  const r = await produceSessionReminders(at);
  const overdue = await produceOverdueReminders(at);
  const letters = await produceWeeklyLetters(at);
  return { reminders: r.written, remindersCancelled: r.cancelled, overdue, letters, total: r.written + overdue + letters };
}
