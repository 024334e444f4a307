import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";

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

/**
 * The student's active enrolment (the view `active_enrolments`) with its syllabus revision number and
 * current cohort: the shape the Today, Syllabus and Ground log pages show. For a scoped read use
 * `activeEnrolment` (db/access/shared/enrolment.ts).
 */
export async function getActiveEnrolment(studentId: string): Promise<StudentEnrolment | null> {
  const [row] = await sequelize.query<StudentEnrolment>(
    `SELECT e.id AS "enrolmentId", co.id AS "courseId", co.code AS "courseCode", co.title AS "courseTitle",
            co.min_ground_minutes AS "minGroundMinutes", r.id AS "revisionId", r.number AS "revisionNumber",
            e.enrolled_on AS "enrolledOn", e.status, c.id AS "cohortId", c.name AS "cohortName", lp.name AS "leadInstructorName"
       FROM active_enrolments e
       JOIN courses co ON co.id = e.course_id
       JOIN syllabus_revisions r ON r.id = e.revision_id
       LEFT JOIN cohort_memberships m ON m.student_id = e.student_id AND m.to_date IS NULL
       LEFT JOIN cohorts c ON c.id = m.cohort_id
       LEFT JOIN people lp ON lp.id = c.lead_instructor_id
      WHERE e.student_id = :studentId
      LIMIT 1`,
    { replacements: { studentId }, type: QueryTypes.SELECT },
  );
  return row ?? null;
}
