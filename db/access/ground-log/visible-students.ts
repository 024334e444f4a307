import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import { accessTo, studentScopeSql } from "../shared/student-scope";
import type { CurrentUser } from "@/lib/auth/session";

/** Whether the caller may see this student's Ground log (the "groundlog" scope: staff, self, a sponsor the student shares hours and attendance with). */
export async function mayViewGroundLog(user: CurrentUser, studentId: string): Promise<boolean> {
  return (await accessTo(user, studentId, "groundlog")) !== null;
}

/** Students whose Ground log the caller may open from the Ground log page; staff also see each one's current cohort. */
export async function groundLogStudentsFor(user: CurrentUser): Promise<{ id: string; name: string; cohortName: string | null }[]> {
  const f = studentScopeSql(user, "groundlog", "p.id");
  return sequelize.query(
    `SELECT p.id, p.name, CASE WHEN ${f.staffSql} THEN c.name END AS "cohortName" FROM people p
       LEFT JOIN cohort_memberships m ON m.student_id = p.id AND m.to_date IS NULL LEFT JOIN cohorts c ON c.id = m.cohort_id
      WHERE p.school_id = :school AND 'student' = ANY(p.roles) AND ${f.sql}
      ORDER BY 3 NULLS LAST, p.name`,
    { replacements: { school: user.schoolId, ...f.replacements }, type: QueryTypes.SELECT },
  );
}
