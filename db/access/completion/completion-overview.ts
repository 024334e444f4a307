import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/can";
import { HttpError } from "@/lib/http/errors";
import type { EndKind } from "@/lib/completion/schema";
import { studentsPage, type StudentsFilter } from "../shared/students-page";

// The chief's End of training list: students in training (with their cohort) and the enrolments
// that ended, newest first, with whether a graduation certificate exists.

export interface InTraining {
  studentId: string;
  name: string;
  courseCode: string;
  enrolledOn: string;
  cohortName: string | null;
}

export interface Ended {
  studentId: string;
  name: string;
  courseCode: string;
  endedOn: string;
  endKind: EndKind | null;
  reason: string | null;
  certified: boolean;
  graduated: boolean;
}

/**
 * The End of training page: one page of the students in training (filtered by cohort and a part of
 * the name, paged in SQL by the shared student pager, deactivated accounts included), their course
 * and enrolment date read for that page only, and the latest 200 ended trainings.
 */
export async function completionOverview(
  user: CurrentUser,
  filter: StudentsFilter = {},
  opts: { page?: number } = {},
): Promise<{
  inTraining: InTraining[];
  inTrainingTotal: number;
  page: number;
  pageSize: number;
  cohorts: { id: string; name: string }[];
  ended: Ended[];
}> {
  if (!can(user, "records.certify")) throw new HttpError(403, "Only the chief instructor ends training");
  const listed = await studentsPage(user, "records", filter, { page: opts.page ?? 1, includeInactive: true });
  const enrolments = listed.rows.length
    ? await sequelize.query<{ studentId: string; courseCode: string; enrolledOn: string }>(
        `SELECT e.student_id AS "studentId", co.code AS "courseCode", e.enrolled_on::text AS "enrolledOn"
           FROM active_enrolments e JOIN courses co ON co.id = e.course_id WHERE e.student_id IN (:ids)`,
        { replacements: { ids: listed.rows.map((r) => r.id) }, type: QueryTypes.SELECT },
      )
    : [];
  const byStudent = new Map(enrolments.map((e) => [e.studentId, e]));
  const inTraining = listed.rows.map((r) => ({
    studentId: r.id,
    name: r.name,
    cohortName: r.cohortName,
    courseCode: byStudent.get(r.id)?.courseCode ?? "",
    enrolledOn: byStudent.get(r.id)?.enrolledOn ?? "",
  }));
  const ended = await sequelize.query<Ended>(
    `SELECT p.id AS "studentId", p.name, co.code AS "courseCode", e.ended_on::text AS "endedOn", e.end_kind AS "endKind",
            e.end_reason AS reason,
            EXISTS (SELECT 1 FROM record_certifications rc WHERE rc.enrolment_id = e.id) AS certified,
            EXISTS (SELECT 1 FROM record_certifications rc WHERE rc.enrolment_id = e.id AND rc.purpose = 'graduation') AS graduated
       FROM people p
       JOIN enrolments e ON e.student_id = p.id AND e.status <> 'active'
       JOIN courses co ON co.id = e.course_id
      WHERE p.school_id = :s AND 'student' = ANY(p.roles)
        AND NOT EXISTS (SELECT 1 FROM active_enrolments a WHERE a.student_id = p.id)
      ORDER BY e.ended_on DESC, p.name, e.id
      LIMIT 200`,
    { replacements: { s: user.schoolId }, type: QueryTypes.SELECT },
  );
  return { inTraining, inTrainingTotal: listed.total, page: listed.page, pageSize: listed.pageSize, cohorts: listed.cohorts, ended };
}
