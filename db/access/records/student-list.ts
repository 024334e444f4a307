import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import { studentScopeSql, type Caller, type ScopePurpose } from "../shared/student-scope";

// The pickers of the Records area: the students (active, with an active enrolment) the caller
// may open, with their current cohort, in one query scoped by the one scoping rule.

export interface ListedStudent {
  id: string;
  name: string;
  cohortName: string | null;
}

async function studentsFor(caller: Caller, purpose: ScopePurpose): Promise<ListedStudent[]> {
  const scope = studentScopeSql(caller, purpose, "p.id");
  return sequelize.query<ListedStudent>(
    `SELECT p.id, p.name, c.name AS "cohortName" FROM people p
       JOIN active_enrolments e ON e.student_id = p.id
       LEFT JOIN cohort_memberships m ON m.student_id = p.id AND m.to_date IS NULL LEFT JOIN cohorts c ON c.id = m.cohort_id
      WHERE p.school_id = :schoolId AND p.active AND ${scope.sql}
      ORDER BY c.name NULLS LAST, p.name`,
    { replacements: { schoolId: caller.schoolId, ...scope.replacements }, type: QueryTypes.SELECT },
  );
}

/** Students whose Progress map the viewer may open (for the picker). */
export function progressStudentsFor(viewer: Caller): Promise<ListedStudent[]> {
  return studentsFor(viewer, "progress");
}

/** Students whose record the caller may keep (staff: the chief's school, an instructor's taught students). */
export function recordStudentsFor(caller: Caller): Promise<ListedStudent[]> {
  return studentsFor(caller, "records");
}
