import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { SyllabusRevision } from "../../models";
import { HttpError } from "@/lib/http/errors";
import { containsPattern } from "../shared/like";

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

export const ENROLMENTS_PAGE_SIZE = 50;

/**
 * One page of a course's active enrolments with the revision each one is on, by student name (then
 * id), optionally narrowed to one revision and to students whose name contains `name`; the number
 * that match from one count. Two queries however many students the course has.
 */
export async function activeEnrolmentsPage(
  schoolId: string,
  courseId: string,
  filter: { name?: string | undefined; revisionId?: string | undefined } = {},
  opts: { page?: number; pageSize?: number } = {},
): Promise<{ rows: EnrolmentOnRevision[]; total: number; page: number; pageSize: number }> {
  const pageSize = opts.pageSize ?? ENROLMENTS_PAGE_SIZE;
  const page = Math.max(1, Math.floor(opts.page ?? 1));
  const replacements = {
    schoolId,
    courseId,
    revisionId: filter.revisionId ?? null,
    name: filter.name ? containsPattern(filter.name) : null,
  };
  const from = `FROM enrolments e JOIN people p ON p.id = e.student_id JOIN courses c ON c.id = e.course_id
      WHERE c.school_id = :schoolId AND c.id = :courseId AND e.status = 'active'
        AND (CAST(:revisionId AS uuid) IS NULL OR e.revision_id = CAST(:revisionId AS uuid))
        AND (CAST(:name AS text) IS NULL OR p.name ILIKE CAST(:name AS text))`;
  const [rows, [count]] = await Promise.all([
    sequelize.query<EnrolmentOnRevision>(
      `SELECT e.id AS "enrolmentId", p.id AS "studentId", p.name AS "studentName", r.id AS "revisionId", r.number AS "revisionNumber",
              e.enrolled_on AS "enrolledOn"
         FROM (SELECT e.id, e.student_id, e.revision_id, e.enrolled_on, p.name ${from} ORDER BY p.name, e.id LIMIT :limit OFFSET :offset) e
         JOIN people p ON p.id = e.student_id JOIN syllabus_revisions r ON r.id = e.revision_id
        ORDER BY e.name, e.id`,
      { replacements: { ...replacements, limit: pageSize, offset: (page - 1) * pageSize }, type: QueryTypes.SELECT },
    ),
    sequelize.query<{ n: number }>(`SELECT count(*)::int AS n ${from}`, { replacements, type: QueryTypes.SELECT }),
  ]);
  return { rows, total: count?.n ?? 0, page, pageSize };
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
