import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/can";
import { HttpError } from "@/lib/http/errors";
import { now } from "@/lib/clock";
import { DEFAULT_AUTHORITY_SETTINGS, type AuthoritySettings } from "@/lib/endorsements/rules";
import type { AuthoritySettingsInput } from "@/lib/endorsements/schema";
import { writeAudit } from "../records/audit-chain";

// The school's authority settings for knowledge tests (wording, pass mark, validity, attempt limit):
// written by the chief, read by every endorsement and result. Until saved, the defaults apply.

export async function authoritySettingsFor(schoolId: string, t?: Transaction): Promise<AuthoritySettings & { saved: boolean }> {
  const [r] = await sequelize.query<AuthoritySettings>(
    `SELECT authority_name AS "authorityName", endorsement_wording AS "endorsementWording", pass_mark_percent AS "passMarkPercent",
            result_validity_months AS "resultValidityMonths", attempt_limit AS "attemptLimit"
       FROM authority_settings WHERE school_id = :schoolId`,
    { replacements: { schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  return r ? { ...r, saved: true } : { ...DEFAULT_AUTHORITY_SETTINGS, saved: false };
}

/** Saves the settings (the chief); the change is an audit-chain event with the values before and after. */
export async function saveAuthoritySettings(t: Transaction, user: CurrentUser, input: AuthoritySettingsInput) {
  if (!can(user, "endorsements.settings")) throw new HttpError(403, "Only the chief instructor changes the authority settings");
  const before = await authoritySettingsFor(user.schoolId, t);
  await sequelize.query(
    `INSERT INTO authority_settings (school_id, authority_name, endorsement_wording, pass_mark_percent, result_validity_months, attempt_limit, updated_by, updated_at)
     VALUES (:schoolId, :authorityName, :endorsementWording, :passMarkPercent, :resultValidityMonths, :attemptLimit, :by, :at)
     ON CONFLICT (school_id) DO UPDATE SET authority_name = EXCLUDED.authority_name, endorsement_wording = EXCLUDED.endorsement_wording,
       pass_mark_percent = EXCLUDED.pass_mark_percent, result_validity_months = EXCLUDED.result_validity_months,
       attempt_limit = EXCLUDED.attempt_limit, updated_by = EXCLUDED.updated_by, updated_at = EXCLUDED.updated_at`,
    { replacements: { schoolId: user.schoolId, ...input, by: user.id, at: now() }, transaction: t },
  );
  await writeAudit(t, {
    schoolId: user.schoolId,
    actor: user,
    action: "endorsement.settings",
    recordType: "authority_settings",
    recordId: user.schoolId,
    before: { ...before, saved: undefined },
    after: input,
  });
  return { ...input };
}
