import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import { can } from "@/lib/auth/can";
import type { CurrentUser } from "@/lib/auth/session";

export interface AssignmentChoices {
  briefings: { id: string; title: string }[];
  demos: { id: string; name: string }[];
  cohorts: { id: string; name: string }[];
  students: { id: string; name: string; cohortName: string }[];
}

/** What a staff member may assign, and to whom: one who may see every student the whole school, an instructor the cohorts they lead. */
export async function assignmentChoices(caller: CurrentUser): Promise<AssignmentChoices> {
  const chief = can(caller, "students.all");
  const r = { schoolId: caller.schoolId, viewer: caller.id, chief };
  const briefings = await sequelize.query<{ id: string; title: string }>(
    `SELECT b.id, r.title FROM briefings b JOIN briefing_revisions r ON r.id = b.current_revision_id WHERE b.school_id = :schoolId ORDER BY lower(r.title)`,
    { replacements: r, type: QueryTypes.SELECT },
  );
  const demos = await sequelize.query<{ id: string; name: string }>(
    `SELECT id, name FROM demos WHERE school_id = :schoolId AND deleted_at IS NULL AND current_revision_id IS NOT NULL ORDER BY lower(name)`,
    { replacements: r, type: QueryTypes.SELECT },
  );
  const cohorts = await sequelize.query<{ id: string; name: string }>(
    `SELECT id, name FROM cohorts WHERE school_id = :schoolId AND (:chief OR lead_instructor_id = :viewer) ORDER BY starts_on, name`,
    { replacements: r, type: QueryTypes.SELECT },
  );
  const students = await sequelize.query<{ id: string; name: string; cohortName: string }>(
    `SELECT p.id, p.name, c.name AS "cohortName" FROM cohort_memberships m JOIN cohorts c ON c.id = m.cohort_id JOIN people p ON p.id = m.student_id
      WHERE c.school_id = :schoolId AND m.to_date IS NULL AND p.active AND (:chief OR c.lead_instructor_id = :viewer)
      ORDER BY c.name, p.name`,
    { replacements: r, type: QueryTypes.SELECT },
  );
  return { briefings, demos, cohorts, students };
}
