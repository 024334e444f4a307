import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/can";
import { HttpError } from "@/lib/http/errors";
import { getSchool } from "../shared/school";
import { recordStudentFor, type RecordStudent } from "./record-student";
import { certificationsOf, type Certification } from "./certifications";
import { graduationGaps } from "./graduation-gaps";

// What the chief's End of training screen for one student shows: the student with their active
// (or newest ended) enrolment, their cohort memberships with dates and reasons, and the
// certifications of their record; while training goes on, what is still missing for graduation.

export interface Membership {
  id: string;
  cohortName: string;
  fromDate: string;
  toDate: string | null;
  endReason: string | null;
}

export interface StudentCompletion {
  student: RecordStudent;
  school: { name: string; timeZone: string };
  memberships: Membership[];
  certifications: Certification[];
  /** unmet conditions of graduation (graduation-gaps.ts); [] once training ended */
  graduationGaps: string[];
}

export async function studentCompletion(user: CurrentUser, studentId: string): Promise<StudentCompletion> {
  if (!can(user, "records.certify")) throw new HttpError(403, "Only the chief instructor ends training");
  const { student } = await recordStudentFor(user, studentId, "records");
  const school = await getSchool(user.schoolId);
  const memberships = await sequelize.query<Membership>(
    `SELECT m.id, c.name AS "cohortName", m.from_date::text AS "fromDate", m.to_date::text AS "toDate", m.end_reason AS "endReason"
       FROM cohort_memberships m JOIN cohorts c ON c.id = m.cohort_id
      WHERE m.student_id = :p AND c.school_id = :s
      ORDER BY m.from_date DESC, m.id`,
    { replacements: { p: student.id, s: user.schoolId }, type: QueryTypes.SELECT },
  );
  const certifications = await certificationsOf(user.schoolId, student.id);
  const gaps = student.ended ? [] : await graduationGaps(student);
  return { student, school: { name: school.name, timeZone: school.timeZone }, memberships, certifications, graduationGaps: gaps };
}
