// Dedicated accounts that end-to-end tests create in the e2e database for tests that would
// otherwise disturb the demo accounts (lockout, password change, deactivation). Made through
// the same data-access code the app uses (db/access/people.ts createPerson), as the app role.
import { randomUUID } from "node:crypto";
import type { Client } from "pg";
import { createPerson } from "@/db/access/people/create-person";
import type { Role } from "@/lib/auth/roles";

export const DEMO_ACCOUNTS = {
  chief: "chief@chalkwing.test",
  instructor: "instructor@chalkwing.test",
  student: "student@chalkwing.test",
  sponsor: "sponsor@chalkwing.test",
} as const;

export async function demoSchoolId(db: Client): Promise<string> {
  const { rows } = await db.query<{ id: string }>(`SELECT id FROM schools WHERE name = 'Larkhollow Flying School'`);
  if (!rows[0]) throw new Error("the demo school is not seeded");
  return rows[0].id;
}

/** A fresh account of the demo school with a unique e-mail. */
export async function makeAccount(db: Client, label: string, password: string, roles: Role[] = ["student"]) {
  const tag = randomUUID().slice(0, 8);
  const schoolId = await demoSchoolId(db);
  const p = await createPerson({ schoolId, name: `E2E ${label} ${tag}`, email: `e2e.${label}.${tag}@chalkwing.test`, roles, password });
  return { ...p, password, schoolId };
}
