import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/can";
import { HttpError } from "@/lib/http/errors";
import type { EndKind } from "@/lib/completion/schema";

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

export async function completionOverview(user: CurrentUser): Promise<{ inTraining: InTraining[]; ended: Ended[] }> {
  if (!can(user, "records.certify")) throw new HttpError(403, "Only the chief instructor ends training");
  const inTraining = await sequelize.query<InTraining>(
    `SELECT p.id AS "studentId", p.name, co.code AS "courseCode", e.enrolled_on::text AS "enrolledOn", c.name AS "cohortName"
       FROM people p
       JOIN active_enrolments e ON e.student_id = p.id
       JOIN courses co ON co.id = e.course_id
       LEFT JOIN cohort_memberships m ON m.student_id = p.id AND m.to_date IS NULL
       LEFT JOIN cohorts c ON c.id = m.cohort_id
      WHERE p.school_id = :s AND 'student' = ANY(p.roles)
      ORDER BY p.name, p.id`,
    { replacements: { s: user.schoolId }, type: QueryTypes.SELECT },
  );
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
  return { inTraining, ended };
}
