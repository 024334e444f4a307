import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { weeklyLetterSections } from "@/lib/auth/student-scope";
import { letterWindow } from "@/lib/mail/letter-week";
import type { AttendanceStatus, WeeklyLetterData } from "@/lib/mail/letter";
import type { CheckOutcome } from "@/lib/records/outcome";
import { dateInZone } from "@/lib/time";
import { activeEnrolment } from "../shared/enrolment";
import { creditedMinutesFor } from "../ground-log/ground-hours";
import type { LetterRecipient } from "./weekly-letter-recipients";

// One Weekly letter's data. Each section's query runs only when the student shares that part with
// this sponsor (weeklyLetterSections, lib/auth/student-scope.ts), so nothing unshared can reach the
// mail; every query is bound to this one student's id. The letter covers the seven days before the
// moment it is written and the seven days after it (letterWindow, lib/mail/letter-week.ts), so a
// weekend session is in one letter or the next, never in none. The course is the student's active
// enrolment (the same one their Progress map shows); the hours are the one hours rule.

export type LetterData = Omit<WeeklyLetterData, "unsubscribeUrl" | "oneClickUrl">;

export async function weeklyLetterData(
  link: LetterRecipient,
  school: { id: string; timeZone: string },
  weekStart: string,
  at: Date,
  t?: Transaction,
): Promise<LetterData> {
  const tz = school.timeZone;
  const w = letterWindow(at, tz);
  const sid = link.studentId;
  const q = <T extends object>(sql: string, replacements: Record<string, unknown> = {}) =>
    sequelize.query<T>(sql, {
      replacements: { sid, from: w.pastFrom, at: w.at, to: w.nextTo, ...replacements },
      type: QueryTypes.SELECT,
      transaction: t,
    });
  const shares = weeklyLetterSections(link.flags);
  const data: LetterData = {
    sponsorName: link.sponsorName,
    studentName: link.studentName,
    weekStart,
    window: { pastFirstDay: w.pastFirstDay, pastLastDay: w.pastLastDay, nextFirstDay: w.nextFirstDay, nextLastDay: w.nextLastDay },
  };

  const weekEntries =
    shares.attendance || shares.hours
      ? await q<{ starts_at: Date; title: string; status: AttendanceStatus; credited_minutes: number }>(
          `SELECT s.starts_at, br.title, g.status, g.credited_minutes
             FROM ground_log_current g JOIN training_sessions s ON s.id = g.session_id JOIN briefing_revisions br ON br.id = s.briefing_revision_id
            WHERE g.student_id = :sid AND s.starts_at >= :from AND s.starts_at < :at ORDER BY s.starts_at`,
        )
      : [];

  if (shares.attendance) {
    data.attendance = weekEntries.map((e) => ({
      startsAt: e.starts_at,
      title: e.title,
      status: e.status,
      creditedMinutes: e.credited_minutes,
    }));
  }

  if (shares.hours) {
    const enrolment = await activeEnrolment(school.id, sid, t);
    if (enrolment) {
      data.hours = {
        weekMinutes: weekEntries.reduce((a, e) => a + e.credited_minutes, 0),
        totalMinutes: await creditedMinutesFor(sid, enrolment.courseId),
        minimumMinutes: enrolment.minGroundMinutes,
        courseTitle: enrolment.courseTitle,
      };
    }
  }

  if (shares.progress) {
    const signedItems = await q<{ code: string; title: string }>(
      `SELECT i.code, i.title FROM sign_offs so JOIN syllabus_items i ON i.id = so.syllabus_item_id
        WHERE so.student_id = :sid AND so.amends_id IS NULL AND so.signed_on > :fromDay AND so.signed_on <= :atDay
          AND NOT EXISTS (SELECT 1 FROM sign_off_withdrawals w WHERE w.sign_off_id = so.id)
        ORDER BY i.code`,
      { fromDay: w.pastFirstDay, atDay: w.pastLastDay },
    );
    const stagesPassed = await q<{ code: string; title: string }>(
      `SELECT st.code, st.title FROM stage_checks sc JOIN syllabus_stages st ON st.id = sc.stage_id
        WHERE sc.student_id = :sid AND sc.result = 'pass' AND sc.occurred_at >= :from AND sc.occurred_at < :at ORDER BY st.position`,
    );
    const makeupsToBook = await q<{ code: string; title: string }>(
      `SELECT i.code, i.title FROM makeup_items m JOIN syllabus_items i ON i.id = m.syllabus_item_id
        WHERE m.student_id = :sid AND m.state = 'open' ORDER BY i.code`,
    );
    // who an assignment is for: the briefings area's view (named student or current cohort member)
    const [late] = await q<{ n: number }>(
      `SELECT count(*)::int AS n FROM assignment_students a
        WHERE a.student_id = :sid AND a.due_on < :today AND a.completed_at IS NULL`,
      { today: dateInZone(at, tz) },
    );
    data.progress = {
      signedItems,
      stagesPassed,
      makeupsToBook,
      lateAssignments: late?.n ?? 0,
      // a missed session is a reason only when the student shares attendance with this sponsor
      missedSessions: shares.attendance ? weekEntries.filter((e) => e.status === "absent").length : null,
    };
  }

  if (shares.outcomes) {
    data.outcomes = (
      await q<{ occurred_at: Date; outcome: CheckOutcome; items: string }>(
        `SELECT c.occurred_at, c.outcome,
                string_agg(DISTINCT i.code || ' ' || i.title, ', ' ORDER BY i.code || ' ' || i.title) AS items
           FROM oral_checks c JOIN oral_check_questions oq ON oq.check_id = c.id JOIN syllabus_items i ON i.id = oq.syllabus_item_id
          WHERE c.student_id = :sid AND c.occurred_at >= :from AND c.occurred_at < :at
            AND NOT EXISTS (SELECT 1 FROM oral_check_withdrawals x WHERE x.check_id = c.id)
            AND NOT EXISTS (SELECT 1 FROM oral_checks a WHERE a.amends_id = c.id)
          GROUP BY c.id, c.occurred_at, c.outcome ORDER BY c.occurred_at`,
      )
    ).map((c) => ({ occurredAt: c.occurred_at, outcome: c.outcome, items: c.items }));
  }

  if (shares.nextWeek) {
    data.nextWeek = (
      await q<{ starts_at: Date; ends_at: Date; title: string; room: string }>(
        `SELECT s.starts_at, s.ends_at, br.title, s.room FROM session_attendees a JOIN training_sessions s ON s.id = a.session_id
           JOIN briefing_revisions br ON br.id = s.briefing_revision_id
          WHERE a.student_id = :sid AND s.status = 'scheduled' AND s.starts_at >= :at AND s.starts_at < :to ORDER BY s.starts_at`,
      )
    ).map((s) => ({ startsAt: s.starts_at, endsAt: s.ends_at, title: s.title, room: s.room }));
  }

  const [note] = await q<{ body: string; author_name: string }>(
    `SELECT n.body, p.name AS author_name FROM sponsor_notes n JOIN people p ON p.id = n.author_id
      WHERE n.student_id = :sid AND n.created_at > :from AND n.created_at <= :at ORDER BY n.created_at DESC LIMIT 1`,
  );
  data.note = note ? { body: note.body, authorName: note.author_name } : null;
  return data;
}
