import "server-only";
import type { Transaction } from "sequelize";
import { School, type SchoolSettings } from "../../models";

// The one read of a school: its name, time zone and settings (defaults filled in).

export const DEFAULT_SETTINGS: Required<
  Pick<SchoolSettings, "checkValidityDays" | "stageCheckPassMarkPercent" | "lateEntryDays" | "reminderLeadHours" | "weeklyLetterDay">
> = {
  checkValidityDays: 60,
  stageCheckPassMarkPercent: 80,
  lateEntryDays: 7,
  reminderLeadHours: 24,
  weeklyLetterDay: 5,
};

export async function createSchool(input: { name: string; timeZone: string; settings?: SchoolSettings }, t?: Transaction) {
  const s = await School.create(
    { name: input.name, timeZone: input.timeZone, settings: { ...DEFAULT_SETTINGS, ...input.settings } },
    { transaction: t },
  );
  return { id: s.id, name: s.name, timeZone: s.timeZone };
}

export type SchoolInfo = Awaited<ReturnType<typeof getSchool>>;

/** The school with its settings; pass the caller's transaction to read inside it (no second connection). */
export async function getSchool(schoolId: string, t?: Transaction) {
  const s = await School.findByPk(schoolId, { transaction: t });
  if (!s) throw new Error("School not found");
  return { id: s.id, name: s.name, timeZone: s.timeZone, settings: { ...DEFAULT_SETTINGS, ...s.settings } };
}
