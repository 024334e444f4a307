import "server-only";
import { forbidden, redirect } from "next/navigation";
import { getCurrentUser, type CurrentUser } from "./session";
import type { Permission } from "./permissions";
import { can } from "./can";
import { HttpError } from "@/lib/http/errors";
import { safeNextPath } from "@/lib/validation/next-path";

export { HttpError };

export { can };

/**
 * For route handlers and server actions: the caller, or an HttpError.
 * No session is 401 before anything is read; a session without the permission is 403.
 */
export async function requirePermission(permission: Permission): Promise<CurrentUser> {
  const user = await getCurrentUser();
  if (!user) throw new HttpError(401, "Sign in to continue");
  if (!can(user, permission)) throw new HttpError(403, "You do not have access to this");
  return user;
}

/** For pages: signed-out visitors go to sign-in; the signed-in without permission see the 403 page. */
export async function requirePagePermission(permission: Permission, nextPath?: string): Promise<CurrentUser> {
  const user = await getCurrentUser();
  if (!user) redirect(`/sign-in${nextPath ? `?next=${encodeURIComponent(safeNextPath(nextPath))}` : ""}`);
  if (!can(user, permission)) forbidden();
  return user;
}
