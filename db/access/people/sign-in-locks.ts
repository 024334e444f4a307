import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import { Person } from "../../models";
import { now } from "@/lib/clock";

// Sign-in locks (counted by db/access/people/sign-in.ts): listing them and lifting them.

/** Lifts every sign-in lock on an account of the school (people.unlock). */
export async function unlockAccount(schoolId: string, personId: string): Promise<number> {
  const person = await Person.findOne({ where: { id: personId, schoolId } });
  if (!person) return 0;
  const [, count] = await sequelize.query(`DELETE FROM sign_in_throttle WHERE email = lower(:email)`, {
    replacements: { email: person.email },
  });
  return (count as unknown as { rowCount?: number })?.rowCount ?? 0;
}

export async function listLockedAccounts(schoolId: string) {
  return sequelize.query<{ personId: string; name: string; email: string; lockedUntil: Date; address: string }>(
    `SELECT p.id AS "personId", p.name, p.email, t.locked_until AS "lockedUntil", t.address
       FROM sign_in_throttle t JOIN people p ON lower(p.email) = t.email
      WHERE p.school_id = :schoolId AND t.locked_until > :at
      ORDER BY t.locked_until DESC`,
    { replacements: { schoolId, at: now() }, type: QueryTypes.SELECT },
  );
}
