import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { consentManager, mayChangeConsent, type Consent, type ConsentManager } from "@/lib/sharing/consent";
import { HttpError } from "@/lib/http/errors";
import { now } from "@/lib/clock";
import { dateInZone } from "@/lib/time";
import { accessTo } from "../shared/student-scope";
import { getSchool } from "../shared/school";

// A student's sponsors and what each may see, for the Sharing page: the student themself, or
// staff who keep the student's records (the one scoping rule, purpose "records").

export interface SponsorConsent {
  linkId: string;
  sponsorId: string;
  sponsorName: string;
  relationship: string;
  consent: Consent;
  /** the sponsor stopped the Weekly letter themself (the student's choice does not override it) */
  sponsorStoppedLetter: boolean;
}

export interface StudentSharing {
  student: { id: string; name: string };
  manager: ConsentManager;
  /** the date of birth on file (yyyy-MM-dd), or null: it decides the manager */
  birthDate: string | null;
  /** whether this caller may change the links */
  mayChange: boolean;
  sponsors: SponsorConsent[];
}

/** The caller's right over this student's sponsor links: 404 when they may not even see them. */
export async function sharingRights(
  caller: Pick<CurrentUser, "id" | "schoolId" | "roles">,
  studentId: string,
  t?: Transaction,
): Promise<{ student: { id: string; name: string }; manager: ConsentManager; birthDate: string | null; mayChange: boolean }> {
  const notFound = new HttpError(404, "studentId: no such student", "studentId");
  const isTheStudent = caller.id === studentId;
  const staff = !isTheStudent && (await accessTo(caller, studentId, "records", t)) === "staff";
  if (!isTheStudent && !staff) throw notFound;
  const [row] = await sequelize.query<{ id: string; name: string; birth_date: string | null }>(
    `SELECT id, name, to_char(birth_date, 'YYYY-MM-DD') AS birth_date FROM people
      WHERE id = :id AND school_id = :school AND 'student' = ANY(roles)`,
    { replacements: { id: studentId, school: caller.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!row) throw notFound;
  const school = await getSchool(caller.schoolId, t);
  const manager = consentManager(row.birth_date, dateInZone(now(), school.timeZone));
  return {
    student: { id: row.id, name: row.name },
    manager,
    birthDate: row.birth_date,
    mayChange: mayChangeConsent(manager, { isTheStudent, staff }),
  };
}

export async function studentSharing(caller: Pick<CurrentUser, "id" | "schoolId" | "roles">, studentId: string): Promise<StudentSharing> {
  const rights = await sharingRights(caller, studentId);
  const rows = await sequelize.query<{
    link_id: string;
    sponsor_id: string;
    sponsor_name: string;
    relationship: string;
    shares_attendance: boolean;
    shares_hours: boolean;
    shares_progress: boolean;
    shares_outcomes: boolean;
    shares_schedule: boolean;
    weekly_letter: boolean;
    stopped: boolean;
  }>(
    `SELECT l.id AS link_id, l.sponsor_id, sp.name AS sponsor_name, l.relationship, l.shares_attendance, l.shares_hours,
            l.shares_progress, l.shares_outcomes, l.shares_schedule, l.weekly_letter,
            EXISTS (SELECT 1 FROM mail_unsubscribes u WHERE u.sponsor_id = l.sponsor_id AND u.student_id = l.student_id AND u.kind = 'weekly.letter') AS stopped
       FROM sponsor_links l JOIN people sp ON sp.id = l.sponsor_id
      WHERE l.student_id = :st AND sp.school_id = :school
      ORDER BY sp.name`,
    { replacements: { st: studentId, school: caller.schoolId }, type: QueryTypes.SELECT },
  );
  return {
    ...rights,
    sponsors: rows.map((r) => ({
      linkId: r.link_id,
      sponsorId: r.sponsor_id,
      sponsorName: r.sponsor_name,
      relationship: r.relationship,
      consent: {
        attendance: r.shares_attendance,
        hours: r.shares_hours,
        milestones: r.shares_progress,
        outcomes: r.shares_outcomes,
        schedule: r.shares_schedule,
        weeklyLetter: r.weekly_letter,
      },
      sponsorStoppedLetter: r.stopped,
    })),
  };
}
