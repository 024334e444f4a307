import { ROLES, type Role } from "./roles";
import { rolesAllow } from "./permissions";

// Which roles the chief gives on the People accounts page. Roles are told apart by what they
// allow (lib/auth/permissions.ts), never by name: a student's role is the one that sees one's own
// progress; it comes with enrolment (the Roster) and ends with the end of training, so it is never
// given or taken here.

/** Roles that make an account a student's. */
export const STUDENT_ROLES: readonly Role[] = ROLES.filter((r) => rolesAllow([r], "students.own"));

/** Whether an account is a student's (it holds a role that sees one's own progress). */
export function isStudentAccount(roles: readonly Role[]): boolean {
  return rolesAllow(roles, "students.own");
}

/** Roles the chief may invite people with and give or take away: staff and sponsors. */
export const ASSIGNABLE_ROLES: readonly Role[] = ROLES.filter((r) => !STUDENT_ROLES.includes(r));

/** Whether a set of roles lets its holder manage accounts (the school must keep one such active person). */
export function managesAccounts(roles: readonly Role[]): boolean {
  return rolesAllow(roles, "people.manage");
}

/** Why a change of roles is refused, or null: a student's account keeps its roles (the Roster and End of training change them). */
export function roleChangeProblem(current: readonly Role[], next: readonly Role[]): string | null {
  if (isStudentAccount(current)) return "a student's roles come with their enrolment: use the Roster and End of training";
  if (isStudentAccount(next)) return "students are added on the Roster, not given the role here";
  return null;
}
