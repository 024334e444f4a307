import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { can } from "@/lib/auth/can";
import type { CurrentUser } from "@/lib/auth/session";

export interface RosterCohort {
  id: string;
  name: string;
  courseId: string;
  leadInstructorId: string;
}

/** Cohorts the caller may add students to: with `roster.all`, every cohort of the school; otherwise those they lead. */
export async function cohortsManagedBy(user: CurrentUser, t?: Transaction): Promise<RosterCohort[]> {
  const all = can(user, "roster.all");
  return sequelize.query<RosterCohort>(
    `SELECT id, name, course_id AS "courseId", lead_instructor_id AS "leadInstructorId" FROM cohorts
      WHERE school_id = :schoolId AND (:all OR lead_instructor_id = :uid) ORDER BY starts_on, name`,
    { replacements: { schoolId: user.schoolId, all, uid: user.id }, type: QueryTypes.SELECT, transaction: t },
  );
}
