import "server-only";
import { Person } from "../../models";
import { hashPassword } from "@/lib/auth/password";
import type { Role } from "@/lib/auth/roles";
import { HttpError } from "@/lib/http/errors";
import { bumpSessionVersion } from "./session-version";

// Changes to an account that end its sessions at once: roles, deactivation, password.

/** Changing roles ends the person's sessions, so a removed role stops working at once. */
export async function setRoles(schoolId: string, personId: string, roles: Role[]) {
  const [count] = await Person.update({ roles: [...new Set(roles)], updatedAt: new Date() }, { where: { id: personId, schoolId } });
  if (!count) throw new HttpError(404, "Person not found");
  await bumpSessionVersion(personId);
}

export async function setActive(schoolId: string, personId: string, active: boolean) {
  const [count] = await Person.update({ active, updatedAt: new Date() }, { where: { id: personId, schoolId } });
  if (!count) throw new HttpError(404, "Person not found");
  await bumpSessionVersion(personId);
}

export async function changePassword(personId: string, password: string) {
  const hash = await hashPassword(password);
  await Person.update({ passwordHash: hash, updatedAt: new Date() }, { where: { id: personId } });
  await bumpSessionVersion(personId);
}
