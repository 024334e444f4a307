import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../index";
import { Cohort, CohortMembership, Enrolment, SponsorLink } from "../models";
import { HttpError } from "@/lib/http/errors";

export async function createCohort(
  input: { schoolId: string; courseId: string; name: string; leadInstructorId: string; startsOn: string },
  t?: Transaction,
) {
  const c = await Cohort.create(input, { transaction: t });
  return { id: c.id, name: c.name };
}

export async function addToCohort(input: { cohortId: string; studentId: string; fromDate: string }, t?: Transaction) {
  const m = await CohortMembership.create({ ...input, toDate: null }, { transaction: t });
  return { id: m.id };
}

/** Moves a student: the old membership ends the day the new one starts; history stays. */
export async function moveStudentToCohort(
  input: { schoolId: string; studentId: string; toCohortId: string; onDate: string },
  t: Transaction,
) {
  const target = await Cohort.findOne({ where: { id: input.toCohortId, schoolId: input.schoolId }, transaction: t });
  if (!target) throw new HttpError(404, "cohort: not found", "toCohortId");
  await sequelize.query(
    `UPDATE cohort_memberships SET to_date = :onDate WHERE student_id = :studentId AND to_date IS NULL AND from_date < :onDate`,
    { replacements: input, transaction: t },
  );
  return addToCohort({ cohortId: input.toCohortId, studentId: input.studentId, fromDate: input.onDate }, t);
}

export async function enrol(input: { studentId: string; courseId: string; revisionId: string; enrolledOn: string }, t?: Transaction) {
  const e = await Enrolment.create({ ...input, status: "active", endedOn: null, endReason: null }, { transaction: t });
  return { id: e.id };
}

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

export interface CohortSummary {
  id: string;
  name: string;
  courseCode: string;
  leadInstructorId: string;
  leadInstructorName: string;
  startsOn: string;
  memberCount: number;
}

/** Cohorts the caller may see: all of the school's for `all`, else those the instructor leads. */
export async function listCohorts(schoolId: string, scope: { leadInstructorId?: string } = {}): Promise<CohortSummary[]> {
  return sequelize.query<CohortSummary>(
    `SELECT c.id, c.name, co.code AS "courseCode", c.lead_instructor_id AS "leadInstructorId", p.name AS "leadInstructorName",
            c.starts_on AS "startsOn",
            (SELECT count(*)::int FROM cohort_memberships m WHERE m.cohort_id = c.id AND m.to_date IS NULL) AS "memberCount"
       FROM cohorts c JOIN courses co ON co.id = c.course_id JOIN people p ON p.id = c.lead_instructor_id
      WHERE c.school_id = :schoolId AND (:lead::uuid IS NULL OR c.lead_instructor_id = :lead::uuid)
      ORDER BY c.starts_on, c.name`,
    { replacements: { schoolId, lead: scope.leadInstructorId ?? null }, type: QueryTypes.SELECT },
  );
}

export interface CohortMember {
  studentId: string;
  name: string;
  email: string;
  fromDate: string;
  toDate: string | null;
}

export async function listCohortMembers(cohortId: string, includePast = false): Promise<CohortMember[]> {
  return sequelize.query<CohortMember>(
    `SELECT m.student_id AS "studentId", p.name, p.email, m.from_date AS "fromDate", m.to_date AS "toDate"
       FROM cohort_memberships m JOIN people p ON p.id = m.student_id
      WHERE m.cohort_id = :cohortId AND (:includePast OR m.to_date IS NULL)
      ORDER BY p.name`,
    { replacements: { cohortId, includePast }, type: QueryTypes.SELECT },
  );
}

/** The students an instructor may see: members (ever) of cohorts they lead; the chief sees all. */
export async function studentIdsVisibleTo(user: { id: string; schoolId: string; roles: string[] }): Promise<string[] | "all"> {
  if (user.roles.includes("chief")) return "all";
  if (!user.roles.includes("instructor")) return [];
  const rows = await sequelize.query<{ id: string }>(
    `SELECT DISTINCT m.student_id AS id FROM cohort_memberships m JOIN cohorts c ON c.id = m.cohort_id
      WHERE c.lead_instructor_id = :uid AND c.school_id = :schoolId`,
    { replacements: { uid: user.id, schoolId: user.schoolId }, type: QueryTypes.SELECT },
  );
  return rows.map((r) => r.id);
}

export interface SponsoredStudent {
  studentId: string;
  name: string;
  sharesAttendance: boolean;
  sharesHours: boolean;
  sharesProgress: boolean;
  sharesSchedule: boolean;
  weeklyLetter: boolean;
}

export async function listSponsoredStudents(sponsorId: string): Promise<SponsoredStudent[]> {
  return sequelize.query<SponsoredStudent>(
    `SELECT l.student_id AS "studentId", p.name, l.shares_attendance AS "sharesAttendance", l.shares_hours AS "sharesHours",
            l.shares_progress AS "sharesProgress", l.shares_schedule AS "sharesSchedule", l.weekly_letter AS "weeklyLetter"
       FROM sponsor_links l JOIN people p ON p.id = l.student_id WHERE l.sponsor_id = :sponsorId ORDER BY p.name`,
    { replacements: { sponsorId }, type: QueryTypes.SELECT },
  );
}

export interface StudentEnrolment {
  enrolmentId: string;
  courseId: string;
  courseCode: string;
  courseTitle: string;
  minGroundMinutes: number;
  revisionId: string;
  revisionNumber: number;
  enrolledOn: string;
  status: string;
  cohortId: string | null;
  cohortName: string | null;
  leadInstructorName: string | null;
}

export async function getActiveEnrolment(studentId: string): Promise<StudentEnrolment | null> {
  const [row] = await sequelize.query<StudentEnrolment>(
    `SELECT e.id AS "enrolmentId", co.id AS "courseId", co.code AS "courseCode", co.title AS "courseTitle",
            co.min_ground_minutes AS "minGroundMinutes", r.id AS "revisionId", r.number AS "revisionNumber",
            e.enrolled_on AS "enrolledOn", e.status, c.id AS "cohortId", c.name AS "cohortName", lp.name AS "leadInstructorName"
       FROM enrolments e
       JOIN courses co ON co.id = e.course_id
       JOIN syllabus_revisions r ON r.id = e.revision_id
       LEFT JOIN cohort_memberships m ON m.student_id = e.student_id AND m.to_date IS NULL
       LEFT JOIN cohorts c ON c.id = m.cohort_id
       LEFT JOIN people lp ON lp.id = c.lead_instructor_id
      WHERE e.student_id = :studentId AND e.status = 'active'
      ORDER BY e.enrolled_on DESC LIMIT 1`,
    { replacements: { studentId }, type: QueryTypes.SELECT },
  );
  return row ?? null;
}
