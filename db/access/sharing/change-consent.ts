import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { consentColumns, type Consent } from "@/lib/sharing/consent";
import type { ConsentInput } from "@/lib/sharing/schema";
import { HttpError } from "@/lib/http/errors";
import { writeAudit } from "../records/audit-chain";
import { sharingRights } from "./sponsors-of-student";

// Changes what one sponsor may see of a student and whether they receive the Weekly letter. It
// takes effect at once: the sponsor's pages and the letter read the link on every request, and a
// letter written but not yet sent is cancelled when the letter is withdrawn. Audited (who, when,
// before, after) in the school's hash-chained trail.

export async function changeConsent(
  caller: Pick<CurrentUser, "id" | "schoolId" | "roles">,
  input: ConsentInput,
  t: Transaction,
): Promise<{ linkId: string; changed: boolean }> {
  const rights = await sharingRights(caller, input.studentId, t);
  if (!rights.mayChange)
    throw new HttpError(
      403,
      rights.manager === "school"
        ? "studentId: the school manages the sponsors of a student under 18"
        : "studentId: only the student decides what their sponsors see",
      "studentId",
    );
  const [link] = await sequelize.query<Record<string, boolean> & { id: string }>(
    `SELECT id, shares_attendance, shares_hours, shares_progress, shares_outcomes, shares_schedule, weekly_letter
       FROM sponsor_links WHERE student_id = :st AND sponsor_id = :sp FOR UPDATE`,
    { replacements: { st: input.studentId, sp: input.sponsorId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!link) throw new HttpError(404, "sponsorId: not a sponsor of this student", "sponsorId");
  const consent: Consent = {
    attendance: input.attendance,
    hours: input.hours,
    milestones: input.milestones,
    outcomes: input.outcomes,
    schedule: input.schedule,
    weeklyLetter: input.weeklyLetter,
  };
  const after = consentColumns(consent);
  const before = Object.fromEntries(Object.keys(after).map((k) => [k, link[k]]));
  const changed = Object.entries(after).some(([k, v]) => before[k] !== v);
  if (!changed) return { linkId: link.id, changed };
  await sequelize.query(
    `UPDATE sponsor_links SET shares_attendance = :shares_attendance, shares_hours = :shares_hours, shares_progress = :shares_progress,
            shares_outcomes = :shares_outcomes, shares_schedule = :shares_schedule, weekly_letter = :weekly_letter
      WHERE id = :id`,
    { replacements: { ...after, id: link.id }, transaction: t },
  );
  // a letter written with the old consent is not sent; freeing its key lets the next tick write
  // this week's letter again with the new consent (if the letter is still wanted)
  await sequelize.query(
    `UPDATE outbox SET state = 'cancelled', last_error = 'what the student shares changed',
            idempotency_key = idempotency_key || ':superseded:' || id
      WHERE state = 'queued' AND kind = 'weekly.letter' AND idempotency_key LIKE :prefix`,
    { replacements: { prefix: `weekly.letter:${input.sponsorId}:${input.studentId}:%` }, transaction: t },
  );
  await writeAudit(t, {
    schoolId: caller.schoolId,
    actor: caller,
    action: "sponsor_link.consent",
    recordType: "sponsor_link",
    recordId: link.id,
    before,
    after,
  });
  return { linkId: link.id, changed };
}
