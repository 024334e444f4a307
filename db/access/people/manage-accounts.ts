import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { HttpError } from "@/lib/http/errors";
import { can } from "@/lib/auth/can";
import type { CurrentUser } from "@/lib/auth/session";
import type { LinkSponsorInput, SetAccountActiveInput } from "@/lib/people/schema";

// The chief's account changes. Deactivation bumps the session version in the same statement, so
// the person's sessions end at once (getCurrentUser compares it on every request).

function requireManager(user: CurrentUser) {
  if (!can(user, "people.manage")) throw new HttpError(403, "You may not manage accounts");
}

export async function setAccountActive(user: CurrentUser, input: SetAccountActiveInput, t: Transaction) {
  requireManager(user);
  if (input.personId === user.id && !input.active) throw new HttpError(409, "personId: you cannot deactivate your own account", "personId");
  const [row] = await sequelize.query<{ id: string; active: boolean }>(
    `UPDATE people SET active = :a, session_version = session_version + 1, updated_at = now()
      WHERE id = :p AND school_id = :s RETURNING id, active`,
    { replacements: { a: input.active, p: input.personId, s: user.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!row) throw new HttpError(404, "personId: no such person at this school", "personId");
  return row;
}

/** Links a sponsor to a student of the school; what is shared starts from the table's defaults (the student's consent page changes it). */
export async function linkSponsorToStudent(user: CurrentUser, input: LinkSponsorInput, t: Transaction) {
  requireManager(user);
  const people = await sequelize.query<{ id: string; roles: string[] }>(
    `SELECT id, roles FROM people WHERE school_id = :s AND id IN (:ids)`,
    {
      replacements: { s: user.schoolId, ids: [input.sponsorId, input.studentId] },
      type: QueryTypes.SELECT,
      transaction: t,
    },
  );
  const roleOf = (id: string) => people.find((p) => p.id === id)?.roles ?? [];
  if (!roleOf(input.sponsorId).includes("sponsor")) throw new HttpError(400, "sponsorId: not a sponsor of this school", "sponsorId");
  if (!roleOf(input.studentId).includes("student")) throw new HttpError(400, "studentId: not a student of this school", "studentId");
  const [row] = await sequelize.query<{ id: string }>(
    `INSERT INTO sponsor_links (sponsor_id, student_id, relationship) VALUES (:sp, :st, :r)
     ON CONFLICT (sponsor_id, student_id) DO NOTHING RETURNING id`,
    { replacements: { sp: input.sponsorId, st: input.studentId, r: input.relationship }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!row) throw new HttpError(409, "studentId: this sponsor is already linked to the student", "studentId");
  return row;
}
