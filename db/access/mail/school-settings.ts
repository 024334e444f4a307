import "server-only";
import type { Transaction } from "sequelize";
import { sequelize } from "../../index";
import type { SchoolSettings } from "../../models";

/** Merges the given settings into the school's settings (other keys are kept). */
export async function updateSchoolSettings(schoolId: string, settings: SchoolSettings, t: Transaction): Promise<void> {
  await sequelize.query(`UPDATE schools SET settings = settings || :s::jsonb WHERE id = :id`, {
    replacements: { s: JSON.stringify(settings), id: schoolId },
    transaction: t,
  });
}
