import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { HttpError } from "@/lib/http/errors";
import type { EndKind } from "@/lib/completion/schema";
import { accessTo, type Caller, type ScopePurpose, type ViewerAccess } from "../shared/student-scope";
import { activeEnrolment, type StudentRef } from "../shared/enrolment";

// A student's record outlives their enrolment (14 CFR 141.101(e): students may have their record at
// any time): the active enrolment when there is one, otherwise the newest ended one. Who may see the
// student is still THE scoping rule (accessTo).

export interface RecordStudent extends StudentRef {
  ended: { on: string; kind: EndKind | null; reason: string | null } | null;
}

async function newestEndedEnrolment(schoolId: string, studentId: string, t?: Transaction): Promise<RecordStudent | null> {
  const [row] = await sequelize.query<StudentRef & { endedOn: string; endKind: EndKind | null; endReason: string | null }>(
    `SELECT p.id, p.name, p.email, e.id AS "enrolmentId", co.id AS "courseId", co.code AS "courseCode", co.title AS "courseTitle",
            co.min_ground_minutes AS "minGroundMinutes", e.revision_id AS "revisionId", e.enrolled_on AS "enrolledOn",
            c.id AS "cohortId", c.name AS "cohortName", c.lead_instructor_id AS "leadInstructorId", lp.name AS "leadInstructorName",
            e.ended_on AS "endedOn", e.end_kind AS "endKind", e.end_reason AS "endReason"
       FROM people p
       JOIN enrolments e ON e.student_id = p.id AND e.status <> 'active'
       JOIN courses co ON co.id = e.course_id
       LEFT JOIN LATERAL (SELECT m.cohort_id FROM cohort_memberships m WHERE m.student_id = p.id
                           ORDER BY m.from_date DESC LIMIT 1) lm ON true
       LEFT JOIN cohorts c ON c.id = lm.cohort_id
       LEFT JOIN people lp ON lp.id = c.lead_instructor_id
      WHERE p.id = :studentId AND p.school_id = :schoolId AND 'student' = ANY(p.roles)
      ORDER BY e.ended_on DESC, e.enrolled_on DESC, e.id LIMIT 1`,
    { replacements: { studentId, schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!row) return null;
  const { endedOn, endKind, endReason, ...ref } = row;
  return { ...ref, ended: { on: endedOn, kind: endKind, reason: endReason } };
}

/** The student (active or newest ended enrolment) if the caller may see them for this purpose; otherwise 404. */
export async function recordStudentFor(
  caller: Caller,
  studentId: string,
  purpose: ScopePurpose,
  t?: Transaction,
): Promise<{ student: RecordStudent; access: ViewerAccess }> {
  const notFound = new HttpError(404, "studentId: no such student", "studentId");
  const access = await accessTo(caller, studentId, purpose, t);
  if (!access) throw notFound;
  const active = await activeEnrolment(caller.schoolId, studentId, t);
  const student = active ? { ...active, ended: null } : await newestEndedEnrolment(caller.schoolId, studentId, t);
  if (!student) throw notFound;
  return { student, access };
}
