import "server-only";
import { cache } from "react";
import { cookies } from "next/headers";
import { decode } from "next-auth/jwt";
import { currentSessionVersion } from "@/db/access/people/session-version";
import type { Role } from "./roles";

export interface CurrentUser {
  id: string;
  name: string;
  roles: Role[];
  schoolId: string;
}

export const SESSION_COOKIES = ["__Secure-next-auth.session-token", "next-auth.session-token"] as const;

/**
 * The signed-in person for this request, or null. The JWT alone is not trusted: the person
 * must still be active and the token's session version must equal the stored one, so
 * sign-out, a password or role change, or deactivation end old sessions at once.
 */
export const getCurrentUser = cache(async (): Promise<CurrentUser | null> => {
  // Integration tests (jest, NODE_ENV=test) call actions in-process as a given person; a
  // production build never takes this branch.
  if (process.env.NODE_ENV === "test") {
    const override = (globalThis as { __chalkwingTestUser?: CurrentUser | null }).__chalkwingTestUser;
    if (override !== undefined) return override;
  }
  const jar = await cookies();
  const raw = SESSION_COOKIES.map((n) => jar.get(n)?.value).find(Boolean);
  if (!raw) return null;
  const secret = process.env.NEXTAUTH_SECRET;
  if (!secret) return null;
  let token: Awaited<ReturnType<typeof decode>> = null;
  try {
    token = await decode({ token: raw, secret });
  } catch {
    return null;
  }
  const uid = typeof token?.uid === "string" ? token.uid : null;
  if (!uid || !/^[0-9a-f-]{36}$/i.test(uid)) return null;
  const stored = await currentSessionVersion(uid);
  if (!stored || !stored.active || stored.sessionVersion !== token?.sv) return null;
  return { id: uid, name: stored.name, roles: stored.roles, schoolId: stored.schoolId };
});

export async function hasSessionCookie(): Promise<boolean> {
  const jar = await cookies();
  return SESSION_COOKIES.some((n) => !!jar.get(n)?.value);
}
