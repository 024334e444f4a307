import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";

// The student's active enrolment, read once here. "Active" is defined by the SQL view
// `active_enrolments` (migration 0500): the newest active enrolment of each student. Queries
// elsewhere that mean "the course this student is on now" join that view, or, in a list that
// stops after a page, `activeEnrolmentLateral` (the same row, probed per student).

/**
 * The row `active_enrolments` gives for one student, as a LATERAL probe of the index
 * enrolments_one_active: `JOIN ${activeEnrolmentLateral("p.id")} e ON true`. For lists read in
 * name order up to a LIMIT (pickers, choices), where a join to the view (a DISTINCT ON over every
 * active enrolment of every school) computes the whole view first: 24–36 ms at 10,000 students,
 * against 1 ms walking people by name (index people_school_name_idx) and probing each.
 */
export const activeEnrolmentLateral = (studentColumn: string) =>
  `LATERAL (SELECT ae.* FROM enrolments ae WHERE ae.student_id = ${studentColumn} AND ae.status = 'active' ORDER BY ae.enrolled_on DESC, ae.id LIMIT 1)`;

export interface StudentRef {
  id: string;
  name: string;
  email: string;
  enrolmentId: string;
  courseId: string;
  courseCode: string;
  courseTitle: string;
  minGroundMinutes: number;
  revisionId: string;
  enrolledOn: string;
  cohortId: string | null;
  cohortName: string | null;
  leadInstructorId: string | null;
  leadInstructorName: string | null;
}

/** A student of the school with their active enrolment, course, current cohort and its lead; null when none. */
export async function activeEnrolment(schoolId: string, studentId: string, t?: Transaction): Promise<StudentRef | null> {
  const [row] = await sequelize.query<StudentRef>(
    `SELECT p.id, p.name, p.email, e.id AS "enrolmentId", co.id AS "courseId", co.code AS "courseCode", co.title AS "courseTitle",
            co.min_ground_minutes AS "minGroundMinutes", e.revision_id AS "revisionId", e.enrolled_on AS "enrolledOn",
            c.id AS "cohortId", c.name AS "cohortName", c.lead_instructor_id AS "leadInstructorId", lp.name AS "leadInstructorName"
       FROM people p
       JOIN active_enrolments e ON e.student_id = p.id
       JOIN courses co ON co.id = e.course_id
       LEFT JOIN cohort_memberships m ON m.student_id = p.id AND m.to_date IS NULL
       LEFT JOIN cohorts c ON c.id = m.cohort_id
       LEFT JOIN people lp ON lp.id = c.lead_instructor_id
      WHERE p.id = :studentId AND p.school_id = :schoolId AND 'student' = ANY(p.roles)
      LIMIT 1`,
    { replacements: { studentId, schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  return row ?? null;
}
