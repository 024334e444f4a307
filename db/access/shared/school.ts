import "server-only";
import { cache } from "react";
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

async function readSchool(schoolId: string, t?: Transaction) {
  const s = await School.findByPk(schoolId, { transaction: t });
  if (!s) throw new Error("School not found");
  return { id: s.id, name: s.name, timeZone: s.timeZone, settings: { ...DEFAULT_SETTINGS, ...s.settings } };
}

/**
 * Read once per page render (React `cache`): a page, its layout and the reads they call each asked
 * for the school again (up to six times on the student's Today). Outside a render (route handlers,
 * the worker, tests) `cache` does not keep anything, so each call reads afresh.
 */
const schoolOfRender = cache((schoolId: string) => readSchool(schoolId));

/**
 * The school with its settings; pass the caller's transaction to read inside it (no second
 * connection, never the render's kept copy: a write and the reads after it see the same transaction).
 */
export async function getSchool(schoolId: string, t?: Transaction) {
  if (t) return readSchool(schoolId, t);
  // a copy, so a caller that changes the object does not change what the next caller of the render gets
  const s = await schoolOfRender(schoolId);
  return { ...s, settings: { ...s.settings } };
}
