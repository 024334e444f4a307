import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import type { PickerChoices } from "@/lib/directory/picker";
import { cohortChoices } from "../directory/cohorts";
import { studentChoices } from "../directory/students";

export interface AssignmentChoices {
  briefings: { id: string; title: string }[];
  demos: { id: string; name: string }[];
  /** listed while few, else searched (GET /api/directory/cohorts?purpose=assignments) */
  cohorts: PickerChoices;
  /** listed while few (each with their cohort as detail), else searched (purpose assignments) */
  students: PickerChoices;
}

/**
 * What a staff member may assign, and to whom: one who may see every student the whole school, an
 * instructor the cohorts they lead (and their students, within the student scope).
 */
export async function assignmentChoices(caller: CurrentUser): Promise<AssignmentChoices> {
  const r = { schoolId: caller.schoolId };
  const briefings = await sequelize.query<{ id: string; title: string }>(
    `SELECT b.id, r.title FROM briefings b JOIN briefing_revisions r ON r.id = b.current_revision_id WHERE b.school_id = :schoolId ORDER BY lower(r.title)`,
    { replacements: r, type: QueryTypes.SELECT },
  );
  const demos = await sequelize.query<{ id: string; name: string }>(
    `SELECT id, name FROM demos WHERE school_id = :schoolId AND deleted_at IS NULL AND current_revision_id IS NOT NULL ORDER BY lower(name)`,
    { replacements: r, type: QueryTypes.SELECT },
  );
  const [cohorts, students] = await Promise.all([cohortChoices(caller, "assignments"), studentChoices(caller, "assignments")]);
  return { briefings, demos, cohorts, students };
}
