import "server-only";
import { QueryTypes } from "sequelize";
import { sequelize } from "../../index";
import { Person } from "../../models";
import { now } from "@/lib/clock";
import { verifyPassword } from "@/lib/auth/password";
import type { Role } from "@/lib/auth/roles";

export const MAX_FAILURES = 10;
export const LOCK_MINUTES = 15;

export interface SignedInPerson {
  id: string;
  name: string;
  roles: Role[];
  sessionVersion: number;
}

/**
 * Checks a sign-in attempt. Unknown e-mail, wrong password, inactive account and a locked
 * (e-mail, address) pair all answer null, after the same bcrypt work, so neither the message
 * nor the timing tells them apart. Counters live in PostgreSQL, so they hold across instances.
 */
export async function attemptSignIn(emailRaw: string, password: string, address: string): Promise<SignedInPerson | null> {
  const email = emailRaw.trim().toLowerCase();
  const at = now();
  const [lock] = await sequelize.query<{ failures: number; locked_until: Date | null }>(
    `SELECT failures, locked_until FROM sign_in_throttle WHERE email = :email AND address = :address`,
    { replacements: { email, address }, type: QueryTypes.SELECT },
  );
  const locked = !!lock?.locked_until && lock.locked_until.getTime() > at.getTime();
  const person = await Person.findOne({ where: sequelize.where(sequelize.fn("lower", sequelize.col("email")), email) });
  const ok = await verifyPassword(password, locked || !person?.active ? null : person?.passwordHash);
  if (ok && person && !locked) {
    await sequelize.query(`DELETE FROM sign_in_throttle WHERE email = :email AND address = :address`, {
      replacements: { email, address },
    });
    return { id: person.id, name: person.name, roles: person.roles, sessionVersion: person.sessionVersion };
  }
  if (!locked) {
    // One statement, so concurrent failures cannot lose a count.
    await sequelize.query(
      `INSERT INTO sign_in_throttle (email, address, failures, locked_until, updated_at)
       VALUES (:email, :address, 1, NULL, :at)
       ON CONFLICT (email, address) DO UPDATE SET
         failures = CASE WHEN sign_in_throttle.locked_until IS NOT NULL AND sign_in_throttle.locked_until <= :at
                         THEN 1 ELSE sign_in_throttle.failures + 1 END,
         locked_until = CASE WHEN (CASE WHEN sign_in_throttle.locked_until IS NOT NULL AND sign_in_throttle.locked_until <= :at
                         THEN 1 ELSE sign_in_throttle.failures + 1 END) >= :max
                         THEN :at::timestamptz + make_interval(mins => :minutes) ELSE NULL END,
         updated_at = :at`,
      { replacements: { email, address, at, max: MAX_FAILURES, minutes: LOCK_MINUTES } },
    );
  }
  return null;
}
