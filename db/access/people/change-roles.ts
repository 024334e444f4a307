import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { HttpError } from "@/lib/http/errors";
import { can } from "@/lib/auth/can";
import type { CurrentUser } from "@/lib/auth/session";
import type { Role } from "@/lib/auth/roles";
import { managesAccounts, roleChangeProblem } from "@/lib/auth/account-roles";
import type { ChangeRolesInput } from "@/lib/people/schema";
import { writeAudit } from "../records/audit-chain";

// The chief changes a person's roles. The session version is bumped in the same statement, so the
// person's sessions end at once (getCurrentUser compares it on every request) and they sign in
// again with what the new roles allow. The school keeps at least one active person who may manage
// accounts: the chief cannot take away their own last such role. Changes of roles are serialised
// per school (an advisory lock), so two chiefs cannot each demote the other at the same time.

export async function changeRoles(
  t: Transaction,
  user: CurrentUser,
  input: ChangeRolesInput,
): Promise<{ personId: string; roles: Role[]; sessionsEnded: boolean }> {
  if (!can(user, "people.manage")) throw new HttpError(403, "You may not manage accounts");
  await sequelize.query(`SELECT pg_advisory_xact_lock(hashtext('people.roles:' || :s))`, {
    replacements: { s: user.schoolId },
    transaction: t,
  });
  const people = await sequelize.query<{ id: string; roles: Role[]; active: boolean }>(
    `SELECT id, roles, active FROM people WHERE school_id = :s`,
    { replacements: { s: user.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  const target = people.find((p) => p.id === input.personId);
  if (!target) throw new HttpError(404, "personId: no such person at this school", "personId");
  const problem = roleChangeProblem(target.roles, input.roles);
  if (problem) throw new HttpError(409, `roles: ${problem}`, "roles");
  const next = [...new Set(input.roles)];
  if (!managesAccounts(next) && !people.some((p) => p.id !== target.id && p.active && managesAccounts(p.roles)))
    throw new HttpError(
      409,
      target.id === user.id
        ? "roles: you are the school's last chief instructor; give another person the chief instructor role first"
        : "roles: the school must keep one chief instructor",
      "roles",
    );
  const had = new Set(target.roles);
  const same = next.length === had.size && next.every((r) => had.has(r));
  if (same) return { personId: target.id, roles: target.roles, sessionsEnded: false };
  await sequelize.query(
    `UPDATE people SET roles = :roles::text[], session_version = session_version + 1, updated_at = now() WHERE id = :p AND school_id = :s`,
    { replacements: { roles: `{${next.join(",")}}`, p: target.id, s: user.schoolId }, transaction: t },
  );
  await writeAudit(t, {
    schoolId: user.schoolId,
    actor: user,
    action: "person.roles_changed",
    recordType: "person",
    recordId: target.id,
    before: { roles: target.roles },
    after: { roles: next },
  });
  return { personId: target.id, roles: next, sessionsEnded: true };
}
