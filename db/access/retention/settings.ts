import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/can";
import { HttpError } from "@/lib/http/errors";
import { now } from "@/lib/clock";
import type { RetentionRule } from "@/lib/retention/rules";
import type { RetentionSettingsInput } from "@/lib/retention/schema";
import { writeAudit } from "../records/audit-chain";

// Which retention rules apply to the school (beside the authority settings of migration 0590).
// Until the chief saves them: the Part 141 school's rules, 14 CFR 141.101(d) and 61.189(c).

export const DEFAULT_RETENTION: RetentionSettingsInput = { schoolRecords: true, instructorRecords: true, easaAto: false };

export function rulesOf(s: RetentionSettingsInput): RetentionRule[] {
  return [
    ...(s.schoolRecords ? (["school_records"] as const) : []),
    ...(s.instructorRecords ? (["instructor_records"] as const) : []),
    ...(s.easaAto ? (["easa_ato"] as const) : []),
  ];
}

export async function retentionSettingsFor(schoolId: string, t?: Transaction): Promise<RetentionSettingsInput & { saved: boolean }> {
  const [r] = await sequelize.query<RetentionSettingsInput>(
    `SELECT school_records AS "schoolRecords", instructor_records AS "instructorRecords", easa_ato AS "easaAto"
       FROM retention_settings WHERE school_id = :schoolId`,
    { replacements: { schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  return r ? { ...r, saved: true } : { ...DEFAULT_RETENTION, saved: false };
}

/** Saves which rules apply (the chief); an audit-chain event with the values before and after. */
export async function saveRetentionSettings(t: Transaction, user: CurrentUser, input: RetentionSettingsInput) {
  if (!can(user, "retention.manage")) throw new HttpError(403, "Only the chief instructor changes the retention rules");
  const before = await retentionSettingsFor(user.schoolId, t);
  await sequelize.query(
    `INSERT INTO retention_settings (school_id, school_records, instructor_records, easa_ato, updated_by, updated_at)
     VALUES (:schoolId, :schoolRecords, :instructorRecords, :easaAto, :by, :at)
     ON CONFLICT (school_id) DO UPDATE SET school_records = EXCLUDED.school_records, instructor_records = EXCLUDED.instructor_records,
       easa_ato = EXCLUDED.easa_ato, updated_by = EXCLUDED.updated_by, updated_at = EXCLUDED.updated_at`,
    { replacements: { schoolId: user.schoolId, ...input, by: user.id, at: now() }, transaction: t },
  );
  await writeAudit(t, {
    schoolId: user.schoolId,
    actor: user,
    action: "retention.settings",
    recordType: "retention_settings",
    recordId: user.schoolId,
    before: { schoolRecords: before.schoolRecords, instructorRecords: before.instructorRecords, easaAto: before.easaAto },
    after: input,
  });
  return { ...input };
}
