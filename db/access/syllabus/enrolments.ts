import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { SyllabusRevision } from "../../models";
import { HttpError } from "@/lib/http/errors";

// Enrolments on syllabus revisions: the chief lists a course's active enrolments and moves one to
// another revision. These list enrolments themselves (a student may have more than one), so they
// read the enrolments table, not the one-per-student view active_enrolments.

export interface EnrolmentOnRevision {
  enrolmentId: string;
  studentId: string;
  studentName: string;
  revisionId: string;
  revisionNumber: number;
  enrolledOn: string;
}

/** Active enrolments on a course, with the revision each one is on. */
export async function listActiveEnrolments(schoolId: string, courseId: string): Promise<EnrolmentOnRevision[]> {
  return sequelize.query<EnrolmentOnRevision>(
    `SELECT e.id AS "enrolmentId", p.id AS "studentId", p.name AS "studentName", r.id AS "revisionId", r.number AS "revisionNumber",
            e.enrolled_on AS "enrolledOn"
       FROM enrolments e JOIN people p ON p.id = e.student_id JOIN syllabus_revisions r ON r.id = e.revision_id
       JOIN courses c ON c.id = e.course_id
      WHERE c.school_id = :schoolId AND c.id = :courseId AND e.status = 'active'
      ORDER BY p.name`,
    { replacements: { schoolId, courseId }, type: QueryTypes.SELECT },
  );
}

/** Moves an enrolment to another revision of the same course (the chief's decision). */
export async function moveEnrolmentToRevision(schoolId: string, enrolmentId: string, revisionId: string, t: Transaction) {
  const [e] = await sequelize.query<{ courseId: string; revisionId: string }>(
    `SELECT e.course_id AS "courseId", e.revision_id AS "revisionId" FROM enrolments e JOIN courses c ON c.id = e.course_id
      WHERE e.id = :enrolmentId AND c.school_id = :schoolId AND e.status = 'active' FOR UPDATE OF e`,
    { replacements: { enrolmentId, schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!e) throw new HttpError(404, "enrolmentId: no such active enrolment", "enrolmentId");
  const target = await SyllabusRevision.findOne({ where: { id: revisionId, courseId: e.courseId }, transaction: t });
  if (!target) throw new HttpError(400, "revisionId: not a revision of the enrolment's course", "revisionId");
  if (e.revisionId === revisionId) return { moved: false, revisionNumber: target.number };
  await sequelize.query(`UPDATE enrolments SET revision_id = :revisionId WHERE id = :enrolmentId`, {
    replacements: { revisionId, enrolmentId },
    transaction: t,
  });
  return { moved: true, revisionNumber: target.number };
}
