import "server-only";
import { sequelize } from "../../index";
import { Person } from "../../models";
import type { Role } from "@/lib/auth/roles";

// The session version: every request compares its token's version with this one, so bumping it
// ends every session of the person at once.

export async function currentSessionVersion(
  personId: string,
): Promise<{ sessionVersion: number; active: boolean; roles: Role[]; name: string; schoolId: string } | null> {
  const p = await Person.findByPk(personId, { attributes: ["sessionVersion", "active", "roles", "name", "schoolId"] });
  return p ? { sessionVersion: p.sessionVersion, active: p.active, roles: p.roles, name: p.name, schoolId: p.schoolId } : null;
}

/** Ends every session of a person at once (sign-out, password or role change, deactivation). */
export async function bumpSessionVersion(personId: string): Promise<void> {
  await sequelize.query(`UPDATE people SET session_version = session_version + 1, updated_at = now() WHERE id = :personId`, {
    replacements: { personId },
  });
}
