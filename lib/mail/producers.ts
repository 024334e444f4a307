import "server-only";
import { inTransaction, type Transaction } from "@/db/access/mail/connection";
import { enqueueMail } from "@/db/access/mail/outbox";
import { overdueAssignments } from "@/db/access/mail/overdue";
import { cancelStaleReminders, dueReminders } from "@/db/access/mail/session-reminders";
import { weeklyLetterData } from "@/db/access/mail/weekly-letter-data";
import { letterSchools, weeklyLetterRecipients, type LetterRecipient, type LetterSchool } from "@/db/access/mail/weekly-letter-recipients";
import { DEFAULT_SETTINGS, getSchool } from "@/db/access/shared/school";
import { letterOfWeek, sendableLetterLink } from "@/db/access/mail/send-letter-now";
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

/** One sponsor's letter about one student, written at `at` (the worker, the chief's preview and "send now"). */
export async function composeLetterFor(link: LetterRecipient, school: LetterSchool, at: Date, t?: Transaction) {
  const { weekStart } = letterWeek(at, school.timeZone, school.settings.weeklyLetterDay ?? DEFAULT_SETTINGS.weeklyLetterDay);
  const data = await weeklyLetterData(link, school, weekStart, at, t);
  const mail = composeWeeklyLetter(
    { ...data, ...unsubscribeLinks(link.sponsorId, link.studentId) },
    { name: school.name, timeZone: school.timeZone, senderName: school.settings.mailSenderName },
  );
  return { weekStart, idempotencyKey: `weekly.letter:${link.sponsorId}:${link.studentId}:${weekStart}`, mail };
}

/** Writes one letter to the outbox in `t`; false when this week's letter for the pair is already written. */
export async function enqueueLetter(t: Transaction, link: LetterRecipient, school: LetterSchool, at: Date): Promise<boolean> {
  const { idempotencyKey, mail } = await composeLetterFor(link, school, at, t);
  return enqueueMail(t, {
    schoolId: school.id,
    kind: "weekly.letter",
    idempotencyKey,
    recipientId: link.sponsorId,
    to: link.sponsorEmail,
    dueAt: at,
    ...mail,
  });
}

/**
 * The chief's "send now": this week's letter for one pair, written at `at` under the week's key
 * (one letter however often it is clicked; the Friday run then finds it written).
 */
export async function sendLetterNow(
  t: Transaction,
  caller: { schoolId: string },
  sponsorId: string,
  studentId: string,
  at: Date,
): Promise<{ outboxId: string; written: boolean; state: string }> {
  const link = await sendableLetterLink(caller, sponsorId, studentId, t);
  const school = await getSchool(caller.schoolId, t);
  const written = await enqueueLetter(t, link, school, at);
  const { weekStart } = letterWeek(at, school.timeZone, school.settings.weeklyLetterDay ?? DEFAULT_SETTINGS.weeklyLetterDay);
  const row = await letterOfWeek(`weekly.letter:${sponsorId}:${studentId}:${weekStart}`, t);
  if (!row) throw new Error("letter not written");
  return { outboxId: row.id, written, state: row.state };
}

/** The Weekly letter to each sponsor who agreed to it, once per week, from the school's letter day on. */
export async function produceWeeklyLetters(at: Date): Promise<number> {
  let written = 0;
  for (const school of await letterSchools()) {
    const { weekStart, due } = letterWeek(at, school.timeZone, school.settings.weeklyLetterDay ?? DEFAULT_SETTINGS.weeklyLetterDay);
    if (!due) continue;
    for (const link of await weeklyLetterRecipients(school.id, weekStart)) {
      if (await inTransaction((t) => enqueueLetter(t, link, school, at))) written++;
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
