import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/can";
import { rolesWith } from "@/lib/auth/permissions";
import { HttpError } from "@/lib/http/errors";
import {
  choicesFrom,
  PICKER_LIST_MAX,
  PICKER_RESULTS,
  type PeoplePickerRole,
  type PickerAnswer,
  type PickerChoices,
  type PickerOption,
} from "@/lib/directory/picker";
import { containsPattern } from "../shared/like";

// The accounts the chief's account pickers offer (people.manage): every account, or those who may
// be linked as a sponsor; by name, LIMITed in SQL.

async function readPeople(user: CurrentUser, role: PeoplePickerRole, q: string, limit: number): Promise<PickerOption[]> {
  if (!can(user, "people.manage")) throw new HttpError(403, "You do not have access to this");
  const rows = await sequelize.query<{ id: string; name: string; active: boolean }>(
    `SELECT p.id, p.name, p.active FROM people p
      WHERE p.school_id = :school ${role === "sponsor" ? "AND p.roles && ARRAY[:sponsorRoles]::text[]" : ""}
        ${q ? "AND (p.name ILIKE :pattern OR p.email ILIKE :pattern)" : ""}
      ORDER BY p.name, p.id LIMIT :limit`,
    {
      replacements: { school: user.schoolId, sponsorRoles: rolesWith("students.sponsored"), pattern: containsPattern(q), limit },
      type: QueryTypes.SELECT,
    },
  );
  return rows.map((r) => (r.active ? { id: r.id, name: r.name } : { id: r.id, name: r.name, detail: "deactivated" }));
}

/** Up to PICKER_RESULTS accounts whose name or e-mail contains `q`, and whether more match. */
export async function searchPeople(user: CurrentUser, role: PeoplePickerRole, q: string): Promise<PickerAnswer> {
  const rows = await readPeople(user, role, q, PICKER_RESULTS + 1);
  return { rows: rows.slice(0, PICKER_RESULTS).map((r) => ({ ...r, primary: r.name })), more: rows.length > PICKER_RESULTS };
}

/** A form's account choices: all of them up to PICKER_LIST_MAX, else "search". */
export async function peopleChoices(user: CurrentUser, role: PeoplePickerRole): Promise<PickerChoices> {
  return choicesFrom(await readPeople(user, role, "", PICKER_LIST_MAX + 1));
}
