import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import type { Role } from "@/lib/auth/roles";
import { studentScopeSql } from "../shared/student-scope";

// Who gets a Weekly letter about whom this week: for each active sponsor of the school, the
// students the one scoping rule opens to them for purpose "mail" (linked, with the Weekly letter
// agreed), minus those they unsubscribed from and those whose letter for this week is written.

export interface LetterSchool {
  id: string;
  name: string;
  timeZone: string;
  settings: { weeklyLetterDay?: number; mailSenderName?: string };
}

/** Every school, oldest first (each has its own letter day and time zone). */
export async function letterSchools(): Promise<LetterSchool[]> {
  return sequelize.query<LetterSchool>(`SELECT id, name, time_zone AS "timeZone", settings FROM schools ORDER BY created_at`, {
    type: QueryTypes.SELECT,
  });
}

export interface LetterRecipient {
  sponsorId: string;
  sponsorName: string;
  sponsorEmail: string;
  studentId: string;
  studentName: string;
  /** the sponsor link's share flags, by column name (what the letter may carry) */
  flags: {
    shares_attendance: boolean;
    shares_hours: boolean;
    shares_progress: boolean;
    shares_outcomes: boolean;
    shares_schedule: boolean;
  };
}

/** The letters still to write for the week starting `weekStart` (yyyy-MM-dd), ordered by sponsor, then student. */
export async function weeklyLetterRecipients(schoolId: string, weekStart: string): Promise<LetterRecipient[]> {
  const sponsors = await sequelize.query<{ id: string; name: string; email: string; roles: Role[] }>(
    `SELECT sp.id, sp.name, sp.email, sp.roles FROM people sp
      WHERE sp.school_id = :school AND sp.active AND EXISTS (SELECT 1 FROM sponsor_links l WHERE l.sponsor_id = sp.id)
      ORDER BY sp.name`,
    { replacements: { school: schoolId }, type: QueryTypes.SELECT },
  );
  const out: LetterRecipient[] = [];
  for (const sponsor of sponsors) {
    const scope = studentScopeSql({ id: sponsor.id, schoolId, roles: sponsor.roles }, "mail", "st.id");
    const rows = await sequelize.query<{
      student_id: string;
      student_name: string;
      shares_attendance: boolean;
      shares_hours: boolean;
      shares_progress: boolean;
      shares_outcomes: boolean;
      shares_schedule: boolean;
    }>(
      `SELECT l.student_id, st.name AS student_name, l.shares_attendance, l.shares_hours, l.shares_progress, l.shares_outcomes, l.shares_schedule
         FROM sponsor_links l JOIN people st ON st.id = l.student_id
        WHERE l.sponsor_id = :sp AND st.school_id = :school AND st.active AND ${scope.sql}
          AND NOT EXISTS (SELECT 1 FROM mail_unsubscribes u WHERE u.sponsor_id = l.sponsor_id AND u.student_id = l.student_id AND u.kind = 'weekly.letter')
          AND NOT EXISTS (SELECT 1 FROM outbox o WHERE o.idempotency_key = 'weekly.letter:' || l.sponsor_id || ':' || l.student_id || ':' || :week)
        ORDER BY st.name`,
      { replacements: { sp: sponsor.id, school: schoolId, week: weekStart, ...scope.replacements }, type: QueryTypes.SELECT },
    );
    for (const r of rows) {
      out.push({
        sponsorId: sponsor.id,
        sponsorName: sponsor.name,
        sponsorEmail: sponsor.email,
        studentId: r.student_id,
        studentName: r.student_name,
        flags: {
          shares_attendance: r.shares_attendance,
          shares_hours: r.shares_hours,
          shares_progress: r.shares_progress,
          shares_outcomes: r.shares_outcomes,
          shares_schedule: r.shares_schedule,
        },
      });
    }
  }
  return out;
}
