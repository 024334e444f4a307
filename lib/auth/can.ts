import type { Role } from "./roles";
import { rolesAllow, type Permission } from "./permissions";

/**
 * Whether the caller's roles grant a permission. Pure (no framework), so the data layer and the
 * scripts that run outside Next (seed, CLI) ask with it too; `lib/auth/guard.ts` re-exports it.
 */
export function can(user: { roles: readonly Role[] }, permission: Permission): boolean {
  return rolesAllow(user.roles, permission);
}
