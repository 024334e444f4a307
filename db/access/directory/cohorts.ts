import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/can";
import { HttpError } from "@/lib/http/errors";
import {
  choicesFrom,
  COHORT_PICKER_RULES,
  PICKER_LIST_MAX,
  PICKER_RESULTS,
  type CohortPickerPurpose,
  type PickerAnswer,
  type PickerChoices,
  type PickerOption,
} from "@/lib/directory/picker";
import { containsPattern } from "../shared/like";

// The cohorts a form's picker offers (the school's, or its open ones), by name, LIMITed in SQL.

async function readCohorts(user: CurrentUser, purpose: CohortPickerPurpose, q: string, limit: number): Promise<PickerOption[]> {
  const rule = COHORT_PICKER_RULES[purpose];
  if (!can(user, rule.permission)) throw new HttpError(403, "You do not have access to this");
  const led = rule.ledOnly && !can(user, "students.all");
  return sequelize.query<PickerOption>(
    `SELECT c.id, c.name FROM cohorts c
      WHERE c.school_id = :school ${rule.openOnly ? "AND c.closed_on IS NULL" : ""} ${led ? "AND c.lead_instructor_id = :viewer" : ""}
        ${q ? "AND c.name ILIKE :pattern" : ""}
      ORDER BY c.name, c.id LIMIT :limit`,
    { replacements: { school: user.schoolId, viewer: user.id, pattern: containsPattern(q), limit }, type: QueryTypes.SELECT },
  );
}

/** Up to PICKER_RESULTS cohorts whose name contains `q`, and whether more match. */
export async function searchCohorts(user: CurrentUser, purpose: CohortPickerPurpose, q: string): Promise<PickerAnswer> {
  const rows = await readCohorts(user, purpose, q, PICKER_RESULTS + 1);
  return { rows: rows.slice(0, PICKER_RESULTS).map((r) => ({ ...r, primary: r.name })), more: rows.length > PICKER_RESULTS };
}

/** A form's cohort choices: all of them up to PICKER_LIST_MAX, else "search". */
export async function cohortChoices(user: CurrentUser, purpose: CohortPickerPurpose): Promise<PickerChoices> {
  return choicesFrom(await readCohorts(user, purpose, "", PICKER_LIST_MAX + 1));
}

/** One cohort of the caller's school by id (the name a search picker shows for a chosen value), or null. */
export async function cohortOption(user: CurrentUser, purpose: CohortPickerPurpose, id: string | undefined): Promise<PickerOption | null> {
  if (!id || !/^[0-9a-f-]{36}$/i.test(id)) return null;
  const rule = COHORT_PICKER_RULES[purpose];
  if (!can(user, rule.permission)) throw new HttpError(403, "You do not have access to this");
  const led = rule.ledOnly && !can(user, "students.all");
  const [row] = await sequelize.query<PickerOption>(
    `SELECT id, name FROM cohorts WHERE id = :id AND school_id = :school ${led ? "AND lead_instructor_id = :viewer" : ""}`,
    { replacements: { id, school: user.schoolId, viewer: user.id }, type: QueryTypes.SELECT },
  );
  return row ?? null;
}
