import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import { activeEnrolmentLateral } from "../shared/enrolment";
import type { CurrentUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/can";
import { HttpError } from "@/lib/http/errors";
import {
  choicesFrom,
  PICKER_LIST_MAX,
  PICKER_RESULTS,
  STUDENT_PICKER_RULES,
  type PickerAnswer,
  type PickerChoices,
  type PickerOption,
  type StudentPickerPurpose,
} from "@/lib/directory/picker";
import { studentScopeSql } from "../shared/student-scope";
import { containsPattern } from "../shared/like";

// The students a form's picker offers: those the caller may see for the form's purpose (through
// the one scoping rule), by name, LIMITed in SQL: one query whatever the size of the school.

async function readStudents(user: CurrentUser, purpose: StudentPickerPurpose, q: string, limit: number): Promise<PickerOption[]> {
  const rule = STUDENT_PICKER_RULES[purpose];
  if (!can(user, rule.permission)) throw new HttpError(403, "You do not have access to this");
  const scope = studentScopeSql(user, rule.scope, "p.id");
  // in a cohort now: the first by name (of those the caller leads, unless they see every student)
  const inCohort = `JOIN LATERAL (SELECT c.name FROM cohort_memberships m JOIN cohorts c ON c.id = m.cohort_id
                      WHERE m.student_id = p.id AND m.to_date IS NULL AND (:all OR c.lead_instructor_id = :viewer)
                      ORDER BY c.name LIMIT 1) mc ON true`;
  const detail = rule.enrolledOnly ? "co.code" : rule.inLedCohort ? "mc.name" : "NULL::text";
  const rows = await sequelize.query<{ id: string; name: string; detail: string | null }>(
    `SELECT p.id, p.name, ${detail} AS detail
       FROM people p
       ${rule.enrolledOnly ? `JOIN ${activeEnrolmentLateral("p.id")} e ON true JOIN courses co ON co.id = e.course_id` : ""}
       ${rule.inLedCohort ? inCohort : ""}
      WHERE p.school_id = :school AND 'student' = ANY(p.roles) ${rule.activeOnly ? "AND p.active" : ""}
        ${rule.sponsoredOnly ? "AND EXISTS (SELECT 1 FROM sponsor_links l WHERE l.student_id = p.id)" : ""}
        AND ${scope.sql} ${q ? "AND p.name ILIKE :pattern" : ""}
      ORDER BY p.name, p.id LIMIT :limit`,
    {
      replacements: {
        school: user.schoolId,
        pattern: containsPattern(q),
        limit,
        all: can(user, "students.all"),
        viewer: user.id,
        ...scope.replacements,
      },
      type: QueryTypes.SELECT,
    },
  );
  return rows.map((r) => (r.detail ? { id: r.id, name: r.name, detail: r.detail } : { id: r.id, name: r.name }));
}

/** Up to PICKER_RESULTS students whose name contains `q`, and whether more match. */
export async function searchStudents(user: CurrentUser, purpose: StudentPickerPurpose, q: string): Promise<PickerAnswer> {
  const rows = await readStudents(user, purpose, q, PICKER_RESULTS + 1);
  return { rows: rows.slice(0, PICKER_RESULTS).map((r) => ({ ...r, primary: r.name })), more: rows.length > PICKER_RESULTS };
}

/** A form's student choices: all of them up to PICKER_LIST_MAX, else "search". */
export async function studentChoices(user: CurrentUser, purpose: StudentPickerPurpose): Promise<PickerChoices> {
  return choicesFrom(await readStudents(user, purpose, "", PICKER_LIST_MAX + 1));
}
