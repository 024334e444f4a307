import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "@/db/index";
import { enqueueMail } from "@/db/access/outbox";
import { DEFAULT_SETTINGS } from "@/db/access/shared/school";
import { dateInZone, formatInZone, zonedInstant } from "@/lib/time";
import { composeMail } from "./compose";
import { composeWeeklyLetter, type AttendanceStatus, type WeeklyLetterData } from "./letter";
import { signUnsubscribe } from "./unsubscribe-token";
import { appLink } from "./compose";

/**
 * The mail the worker writes itself, decided by the clock value it is given: session reminders,
 * overdue-assignment reminders and the Weekly letter. Each is idempotent (its outbox key names
 * what it is about and its revision), so running it twice, or from two workers, writes each mail
 * once. Each producer checks that the tables it reads exist (other areas add them) and does
 * nothing until they do.
 */

/** Local hour on the letter day from which the Weekly letter goes out. */
export const LETTER_HOUR = 17;
/** Overdue reminders are written for assignments due at most this many days ago. */
export const OVERDUE_LOOKBACK_DAYS = 14;

async function tablesExist(names: string[], t?: Transaction): Promise<boolean> {
  const [row] = await sequelize.query<{ ok: boolean }>(
    `SELECT bool_and(to_regclass('public.' || n) IS NOT NULL) AS ok FROM unnest(ARRAY[:names]::text[]) AS n`,
    { replacements: { names }, type: QueryTypes.SELECT, transaction: t },
  );
  return !!row?.ok;
}

function addDays(isoDate: string, days: number): string {
  return new Date(Date.parse(`${isoDate}T12:00:00Z`) + days * 86_400_000).toISOString().slice(0, 10);
}

// ------------------------------------------------------------------ session reminders

/**
 * One reminder per attendee when `now` is within the school's lead time before a scheduled
 * session. The key carries the session's `sequence`, so a moved session gets exactly one new
 * reminder; a queued reminder for an earlier sequence (or a cancelled session) is cancelled.
 */
export async function produceSessionReminders(at: Date): Promise<{ written: number; cancelled: number }> {
  if (!(await tablesExist(["training_sessions", "session_attendees", "briefing_revisions"]))) return { written: 0, cancelled: 0 };
  return sequelize.transaction(async (t) => {
    const [, cancelledCount] = await sequelize.query(
      `UPDATE outbox o SET state = 'cancelled', last_error = 'the session was moved or cancelled before this reminder went out'
         FROM training_sessions s
        WHERE o.kind = 'session.reminder' AND o.state = 'queued'
          AND split_part(o.idempotency_key, ':', 2) = s.id::text
          AND (s.status <> 'scheduled' OR split_part(o.idempotency_key, ':', 3) <> s.sequence::text)`,
      { transaction: t },
    );
    const rows = await sequelize.query<{
      session_id: string;
      sequence: number;
      school_id: string;
      starts_at: Date;
      ends_at: Date;
      room: string;
      title: string;
      instructor_name: string;
      school_name: string;
      time_zone: string;
      sender_name: string | null;
      person_id: string;
      person_name: string;
      email: string;
    }>(
      `SELECT s.id AS session_id, s.sequence, s.school_id, s.starts_at, s.ends_at, s.room, br.title, ip.name AS instructor_name,
              sc.name AS school_name, sc.time_zone, sc.settings->>'mailSenderName' AS sender_name,
              p.id AS person_id, p.name AS person_name, p.email
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
    let written = 0;
    for (const r of rows) {
      const school = { name: r.school_name, timeZone: r.time_zone, senderName: r.sender_name ?? undefined };
      const mail = composeMail(
        "session.reminder",
        {
          name: r.person_name,
          briefingTitle: r.title,
          startsAt: r.starts_at,
          endsAt: r.ends_at,
          room: r.room,
          instructorName: r.instructor_name,
        },
        school,
      );
      const ok = await enqueueMail(t, {
        schoolId: r.school_id,
        kind: "session.reminder",
        idempotencyKey: `session.reminder:${r.session_id}:${r.sequence}:${r.person_id}`,
        recipientId: r.person_id,
        to: r.email,
        dueAt: at,
        ...mail,
      });
      if (ok) written++;
    }
    return { written, cancelled: Number(cancelledCount ?? 0) || 0 };
  });
}

// ------------------------------------------------------------------ overdue assignments

/** One reminder per student and assignment once its due date has passed (school's calendar) without being marked done. */
export async function produceOverdueReminders(at: Date): Promise<number> {
  if (!(await tablesExist(["assignments", "assignment_completions", "briefings", "briefing_revisions"]))) return 0;
  const hasDemos = await tablesExist(["demos"]);
  const hasView = await tablesExist(["assignment_students"]);
  return sequelize.transaction(async (t) => {
    const rows = await sequelize.query<{
      id: string;
      school_id: string;
      kind: "briefing" | "demo";
      due_on: string;
      student_id: string;
      name: string;
      email: string;
      title: string | null;
      school_name: string;
      time_zone: string;
      sender_name: string | null;
    }>(
      `WITH targets AS (${
        hasView
          ? // the briefings area's own answer to "who is this assignment for"
            `SELECT assignment_id AS id, school_id, kind, briefing_id, demo_id, due_on, student_id FROM assignment_students`
          : `SELECT a.id, a.school_id, a.kind, a.briefing_id, a.demo_id, a.due_on, a.student_id FROM assignments a WHERE a.student_id IS NOT NULL
              UNION
              SELECT a.id, a.school_id, a.kind, a.briefing_id, a.demo_id, a.due_on, m.student_id
                FROM assignments a JOIN cohort_memberships m ON m.cohort_id = a.cohort_id AND m.to_date IS NULL`
      }
       )
       SELECT tg.id, tg.school_id, tg.kind, tg.due_on, tg.student_id, p.name, p.email,
              ${hasDemos ? "COALESCE(br.title, d.name)" : "br.title"} AS title,
              sc.name AS school_name, sc.time_zone, sc.settings->>'mailSenderName' AS sender_name
         FROM targets tg
         JOIN schools sc ON sc.id = tg.school_id
         JOIN people p ON p.id = tg.student_id AND p.active AND 'student' = ANY (p.roles)
         LEFT JOIN briefings b ON b.id = tg.briefing_id
         LEFT JOIN briefing_revisions br ON br.id = b.current_revision_id
         ${hasDemos ? "LEFT JOIN demos d ON d.id = tg.demo_id" : ""}
        WHERE tg.due_on < (:at::timestamptz AT TIME ZONE sc.time_zone)::date
          AND tg.due_on >= (:at::timestamptz AT TIME ZONE sc.time_zone)::date - :lookback
          AND NOT EXISTS (SELECT 1 FROM assignment_completions c WHERE c.assignment_id = tg.id AND c.student_id = tg.student_id)
          AND NOT EXISTS (SELECT 1 FROM outbox o WHERE o.idempotency_key = 'assignment.overdue:' || tg.id || ':' || tg.student_id || ':' || tg.due_on)
        ORDER BY tg.due_on`,
      { replacements: { at, lookback: OVERDUE_LOOKBACK_DAYS }, type: QueryTypes.SELECT, transaction: t },
    );
    let written = 0;
    for (const r of rows) {
      const mail = composeMail(
        "assignment.overdue",
        {
          name: r.name,
          title: r.title ?? (r.kind === "demo" ? "Assigned demo" : "Assigned briefing"),
          assignmentKind: r.kind,
          dueOn: r.due_on,
          path: `/assignments#a-${r.id}`,
        },
        { name: r.school_name, timeZone: r.time_zone, senderName: r.sender_name ?? undefined },
      );
      const ok = await enqueueMail(t, {
        schoolId: r.school_id,
        kind: "assignment.overdue",
        idempotencyKey: `assignment.overdue:${r.id}:${r.student_id}:${r.due_on}`,
        recipientId: r.student_id,
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

interface LinkRow {
  sponsor_id: string;
  sponsor_name: string;
  sponsor_email: string;
  student_id: string;
  student_name: string;
  shares_attendance: boolean;
  shares_hours: boolean;
  shares_progress: boolean;
  shares_schedule: boolean;
}

interface SchoolRow {
  id: string;
  name: string;
  time_zone: string;
  settings: { weeklyLetterDay?: number; mailSenderName?: string };
}

/** The Monday (yyyy-MM-dd) of the week holding `at` in the school's zone, and whether the letter is due. */
export function letterWeek(at: Date, timeZone: string, letterDay: number): { weekStart: string; due: boolean } {
  const today = dateInZone(at, timeZone);
  const isoDow = Number(formatInZone(at, timeZone, "i")); // 1 = Monday … 7 = Sunday
  const hour = Number(formatInZone(at, timeZone, "H"));
  const weekStart = addDays(today, -(isoDow - 1));
  const letterIdx = (letterDay + 6) % 7; // settings: 0 = Sunday … 6 = Saturday
  const todayIdx = isoDow - 1;
  const due = todayIdx > letterIdx || (todayIdx === letterIdx && hour >= LETTER_HOUR);
  return { weekStart, due };
}

/**
 * Gathers one letter's data. Each section's query runs only when the student shares that part
 * with this sponsor, so nothing unshared can reach the mail. Every query is bound to this one
 * student's id.
 */
export async function gatherLetter(
  link: LinkRow,
  school: SchoolRow,
  weekStart: string,
  at: Date,
  t?: Transaction,
): Promise<Omit<WeeklyLetterData, "unsubscribeUrl" | "oneClickUrl">> {
  const tz = school.time_zone;
  const ws = zonedInstant(weekStart, "00:00", tz);
  const we = zonedInstant(addDays(weekStart, 7), "00:00", tz);
  const nwe = zonedInstant(addDays(weekStart, 14), "00:00", tz);
  const sid = link.student_id;
  const q = <T extends object>(sql: string, replacements: Record<string, unknown> = {}) =>
    sequelize.query<T>(sql, { replacements: { sid, ws, we, nwe, ...replacements }, type: QueryTypes.SELECT, transaction: t });
  const hasLog = await tablesExist(["ground_log_entries", "training_sessions", "briefing_revisions"], t);
  const data: Omit<WeeklyLetterData, "unsubscribeUrl" | "oneClickUrl"> = {
    sponsorName: link.sponsor_name,
    studentName: link.student_name,
    weekStart,
  };

  const [enrolment] = await q<{ course_id: string; title: string; min_ground_minutes: number }>(
    `SELECT c.id AS course_id, c.title, c.min_ground_minutes FROM enrolments e JOIN courses c ON c.id = e.course_id
      WHERE e.student_id = :sid AND e.status = 'active' ORDER BY e.enrolled_on LIMIT 1`,
  );

  const weekEntries = hasLog
    ? await q<{ starts_at: Date; title: string; status: AttendanceStatus; credited_minutes: number }>(
        `SELECT s.starts_at, br.title, g.status, g.credited_minutes
           FROM ground_log_current g JOIN training_sessions s ON s.id = g.session_id JOIN briefing_revisions br ON br.id = s.briefing_revision_id
          WHERE g.student_id = :sid AND s.starts_at >= :ws AND s.starts_at < :we ORDER BY s.starts_at`,
      )
    : [];

  if (link.shares_attendance) {
    data.attendance = weekEntries.map((e) => ({
      startsAt: e.starts_at,
      title: e.title,
      status: e.status,
      creditedMinutes: e.credited_minutes,
    }));
  }

  if (link.shares_hours && enrolment) {
    let total = 0;
    if (hasLog) {
      const [row] = await q<{ m: number }>(
        `SELECT COALESCE(sum(credited_minutes), 0)::int AS m FROM ground_log_current WHERE student_id = :sid AND course_id = :cid`,
        { cid: enrolment.course_id },
      );
      total = row?.m ?? 0;
    }
    data.hours = {
      weekMinutes: weekEntries.reduce((a, e) => a + e.credited_minutes, 0),
      totalMinutes: total,
      minimumMinutes: enrolment.min_ground_minutes,
      courseTitle: enrolment.title,
    };
  }

  if (link.shares_progress) {
    const signedItems = (await tablesExist(["sign_offs", "sign_off_withdrawals"], t))
      ? await q<{ code: string; title: string }>(
          `SELECT i.code, i.title FROM sign_offs so JOIN syllabus_items i ON i.id = so.syllabus_item_id
            WHERE so.student_id = :sid AND so.amends_id IS NULL AND so.signed_on >= :wsd AND so.signed_on < :wed
              AND NOT EXISTS (SELECT 1 FROM sign_off_withdrawals w WHERE w.sign_off_id = so.id)
            ORDER BY i.code`,
          { wsd: weekStart, wed: addDays(weekStart, 7) },
        )
      : [];
    const stagesPassed = (await tablesExist(["stage_checks"], t))
      ? await q<{ code: string; title: string }>(
          `SELECT st.code, st.title FROM stage_checks sc JOIN syllabus_stages st ON st.id = sc.stage_id
            WHERE sc.student_id = :sid AND sc.result = 'pass' AND sc.occurred_at >= :ws AND sc.occurred_at < :we ORDER BY st.position`,
        )
      : [];
    const makeupsToBook = (await tablesExist(["makeup_items"], t))
      ? await q<{ code: string; title: string }>(
          `SELECT i.code, i.title FROM makeup_items m JOIN syllabus_items i ON i.id = m.syllabus_item_id
            WHERE m.student_id = :sid AND m.state = 'open' ORDER BY i.code`,
        )
      : [];
    const reasons: string[] = [];
    if (makeupsToBook.length > 0)
      reasons.push(
        `${makeupsToBook.length === 1 ? "one make-up item is" : `${makeupsToBook.length} make-up items are`} still to be booked`,
      );
    if (link.shares_attendance) {
      const missed = weekEntries.filter((e) => e.status === "absent").length;
      if (missed > 0) reasons.push(`${missed === 1 ? "one session" : `${missed} sessions`} missed this week without an excuse`);
    }
    if (await tablesExist(["assignments", "assignment_completions"], t)) {
      const [row] = await q<{ n: number }>(
        `SELECT count(*)::int AS n FROM assignments a
          WHERE (a.student_id = :sid OR a.cohort_id IN (SELECT cohort_id FROM cohort_memberships m WHERE m.student_id = :sid AND m.to_date IS NULL))
            AND a.due_on < :today
            AND NOT EXISTS (SELECT 1 FROM assignment_completions c WHERE c.assignment_id = a.id AND c.student_id = :sid)`,
        { today: dateInZone(at, tz) },
      );
      const n = row?.n ?? 0;
      if (n > 0) reasons.push(`${n === 1 ? "one assignment is" : `${n} assignments are`} past the due date and not done`);
    }
    data.progress = { signedItems, stagesPassed, behindReasons: reasons, makeupsToBook };
  }

  if (link.shares_schedule && (await tablesExist(["training_sessions", "session_attendees", "briefing_revisions"], t))) {
    data.nextWeek = (
      await q<{ starts_at: Date; ends_at: Date; title: string; room: string }>(
        `SELECT s.starts_at, s.ends_at, br.title, s.room FROM session_attendees a JOIN training_sessions s ON s.id = a.session_id
           JOIN briefing_revisions br ON br.id = s.briefing_revision_id
          WHERE a.student_id = :sid AND s.status = 'scheduled' AND s.starts_at >= :we AND s.starts_at < :nwe ORDER BY s.starts_at`,
      )
    ).map((s) => ({ startsAt: s.starts_at, endsAt: s.ends_at, title: s.title, room: s.room }));
  }

  const [note] = await q<{ body: string; author_name: string }>(
    `SELECT n.body, p.name AS author_name FROM sponsor_notes n JOIN people p ON p.id = n.author_id
      WHERE n.student_id = :sid AND n.created_at > :since AND n.created_at <= :at ORDER BY n.created_at DESC LIMIT 1`,
    { since: new Date(at.getTime() - 7 * 86_400_000), at },
  );
  data.note = note ? { body: note.body, authorName: note.author_name } : null;
  return data;
}

export function unsubscribeLinks(sponsorId: string, studentId: string) {
  const token = signUnsubscribe({ sponsorId, studentId, kind: "weekly.letter" });
  return { unsubscribeUrl: appLink(`/unsubscribe/${token}`), oneClickUrl: appLink(`/api/unsubscribe?token=${encodeURIComponent(token)}`) };
}

/** The Weekly letter to each sponsor who agreed to it, once per week, from the school's letter day on. */
export async function produceWeeklyLetters(at: Date): Promise<number> {
  const schools = await sequelize.query<SchoolRow>(`SELECT id, name, time_zone, settings FROM schools ORDER BY created_at`, {
    type: QueryTypes.SELECT,
  });
  let written = 0;
  for (const school of schools) {
    const { weekStart, due } = letterWeek(at, school.time_zone, school.settings.weeklyLetterDay ?? DEFAULT_SETTINGS.weeklyLetterDay);
    if (!due) continue;
    const links = await sequelize.query<LinkRow>(
      `SELECT l.sponsor_id, sp.name AS sponsor_name, sp.email AS sponsor_email, l.student_id, st.name AS student_name,
              l.shares_attendance, l.shares_hours, l.shares_progress, l.shares_schedule
         FROM sponsor_links l JOIN people sp ON sp.id = l.sponsor_id JOIN people st ON st.id = l.student_id
        WHERE st.school_id = :school AND sp.school_id = :school AND l.weekly_letter AND sp.active AND st.active
          AND NOT EXISTS (SELECT 1 FROM mail_unsubscribes u WHERE u.sponsor_id = l.sponsor_id AND u.student_id = l.student_id AND u.kind = 'weekly.letter')
          AND NOT EXISTS (SELECT 1 FROM outbox o WHERE o.idempotency_key = 'weekly.letter:' || l.sponsor_id || ':' || l.student_id || ':' || :week)
        ORDER BY sp.name, st.name`,
      { replacements: { school: school.id, week: weekStart }, type: QueryTypes.SELECT },
    );
    for (const link of links) {
      const wrote = await sequelize.transaction(async (t) => {
        const data = await gatherLetter(link, school, weekStart, at, t);
        const mail = composeWeeklyLetter(
          { ...data, ...unsubscribeLinks(link.sponsor_id, link.student_id) },
          { name: school.name, timeZone: school.time_zone, senderName: school.settings.mailSenderName },
        );
        return enqueueMail(t, {
          schoolId: school.id,
          kind: "weekly.letter",
          idempotencyKey: `weekly.letter:${link.sponsor_id}:${link.student_id}:${weekStart}`,
          recipientId: link.sponsor_id,
          to: link.sponsor_email,
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
