import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { SponsorLink } from "../../models";

/** Links a sponsor to a student, with what the student shares (everything unless said otherwise). */
export async function linkSponsor(
  input: {
    sponsorId: string;
    studentId: string;
    relationship?: string;
    shares?: Partial<Record<"attendance" | "hours" | "progress" | "schedule", boolean>>;
    weeklyLetter?: boolean;
  },
  t?: Transaction,
) {
  const l = await SponsorLink.create(
    {
      sponsorId: input.sponsorId,
      studentId: input.studentId,
      relationship: input.relationship ?? "sponsor",
      sharesAttendance: input.shares?.attendance ?? true,
      sharesHours: input.shares?.hours ?? true,
      sharesProgress: input.shares?.progress ?? true,
      sharesSchedule: input.shares?.schedule ?? true,
      weeklyLetter: input.weeklyLetter ?? true,
    },
    { transaction: t },
  );
  return { id: l.id };
}

export interface SponsoredStudent {
  studentId: string;
  name: string;
  sharesAttendance: boolean;
  sharesHours: boolean;
  sharesProgress: boolean;
  sharesSchedule: boolean;
  /** the sponsor receives the Weekly letter: the student agreed and the sponsor has not stopped it */
  weeklyLetter: boolean;
}

export async function listSponsoredStudents(sponsorId: string): Promise<SponsoredStudent[]> {
  return sequelize.query<SponsoredStudent>(
    `SELECT l.student_id AS "studentId", p.name, l.shares_attendance AS "sharesAttendance", l.shares_hours AS "sharesHours",
            l.shares_progress AS "sharesProgress", l.shares_schedule AS "sharesSchedule",
            l.weekly_letter AND NOT EXISTS (SELECT 1 FROM mail_unsubscribes u
              WHERE u.sponsor_id = l.sponsor_id AND u.student_id = l.student_id AND u.kind = 'weekly.letter') AS "weeklyLetter"
       FROM sponsor_links l JOIN people p ON p.id = l.student_id WHERE l.sponsor_id = :sponsorId ORDER BY p.name`,
    { replacements: { sponsorId }, type: QueryTypes.SELECT },
  );
}
