import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/can";
import { rolesWith } from "@/lib/auth/permissions";
import { HttpError } from "@/lib/http/errors";
import {
  choicesFrom,
  DESIGNATED_DETAIL,
  INSTRUCTOR_PICKER_RULES,
  PICKER_LIST_MAX,
  PICKER_RESULTS,
  type InstructorPickerPurpose,
  type PickerAnswer,
  type PickerChoices,
  type PickerOption,
} from "@/lib/directory/picker";
import { containsPattern } from "../shared/like";

// The instructors a form's picker offers (who may teach, sign or lead, per the form), by name,
// LIMITed in SQL: one query whatever the size of the school.

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

async function readInstructors(
  user: CurrentUser,
  purpose: InstructorPickerPurpose,
  q: string,
  limit: number,
  id?: string,
): Promise<PickerOption[]> {
  const rule = INSTRUCTOR_PICKER_RULES[purpose];
  if (!can(user, rule.permission)) throw new HttpError(403, "You do not have access to this");
  const rows = await sequelize.query<{ id: string; name: string; active: boolean; designated: boolean }>(
    `SELECT p.id, p.name, p.active,
            ${rule.qualifiedOnly ? "EXISTS (SELECT 1 FROM instructor_qualifications_current q WHERE q.person_id = p.id AND q.check_instructor)" : "false"} AS designated
       FROM people p
      WHERE p.school_id = :school AND p.roles && ARRAY[:holders]::text[] ${rule.activeOnly ? "AND p.active" : ""}
        ${rule.qualifiedOnly ? "AND EXISTS (SELECT 1 FROM instructor_qualifications_current q WHERE q.person_id = p.id)" : ""}
        ${q ? "AND p.name ILIKE :pattern" : ""} ${id ? "AND p.id = CAST(:id AS uuid)" : ""}
      ORDER BY p.name, p.id LIMIT :limit`,
    {
      replacements: { school: user.schoolId, holders: rolesWith(rule.holders), pattern: containsPattern(q), id: id ?? null, limit },
      type: QueryTypes.SELECT,
    },
  );
  return rows.map((r) =>
    !r.active
      ? { id: r.id, name: r.name, detail: "deactivated" }
      : rule.qualifiedOnly && r.designated
        ? { id: r.id, name: r.name, detail: DESIGNATED_DETAIL }
        : { id: r.id, name: r.name },
  );
}

/** Up to PICKER_RESULTS instructors whose name contains `q`, and whether more match. */
export async function searchInstructors(user: CurrentUser, purpose: InstructorPickerPurpose, q: string): Promise<PickerAnswer> {
  const rows = await readInstructors(user, purpose, q, PICKER_RESULTS + 1);
  return { rows: rows.slice(0, PICKER_RESULTS).map((r) => ({ ...r, primary: r.name })), more: rows.length > PICKER_RESULTS };
}

/** A form's instructor choices: all of them up to PICKER_LIST_MAX, else "search". */
export async function instructorChoices(user: CurrentUser, purpose: InstructorPickerPurpose): Promise<PickerChoices> {
  return choicesFrom(await readInstructors(user, purpose, "", PICKER_LIST_MAX + 1));
}

/** One instructor the form may offer, by id (the name a search picker shows for a chosen value), or null. */
export async function instructorOption(
  user: CurrentUser,
  purpose: InstructorPickerPurpose,
  id: string | undefined,
): Promise<PickerOption | null> {
  if (!id || !UUID.test(id)) return null;
  const [row] = await readInstructors(user, purpose, "", 1, id);
  return row ?? null;
}
