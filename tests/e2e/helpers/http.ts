// HTTP helpers for end-to-end tests: sign in through next-auth's own endpoints (no browser),
// and call route handlers and server actions over HTTP against the production build.
import { BASE_URL } from "./browser";

export const SESSION_COOKIE = "next-auth.session-token";

/** "name=value" pairs from a response's Set-Cookie headers (attributes dropped). */
export function cookiesFrom(res: Response): Map<string, string> {
  const out = new Map<string, string>();
  for (const line of res.headers.getSetCookie()) {
    const pair = line.split(";")[0] ?? "";
    const eq = pair.indexOf("=");
    if (eq > 0) out.set(pair.slice(0, eq).trim(), pair.slice(eq + 1).trim());
  }
  return out;
}

export function cookieHeader(jar: Map<string, string>): string {
  return [...jar].map(([k, v]) => `${k}=${v}`).join("; ");
}

export interface SignInResult {
  ok: boolean;
  /** "next-auth.session-token=…" when signed in, else null */
  cookie: string | null;
  status: number;
  url: string | null;
}

/**
 * Signs in with e-mail and password through /api/auth/csrf and the credentials callback.
 * `address` sets X-Forwarded-For so a test can use an (e-mail, address) pair of its own.
 */
export async function signInHttp(email: string, password: string, opts: { address?: string } = {}): Promise<SignInResult> {
  const extra: Record<string, string> = opts.address ? { "x-forwarded-for": opts.address } : {};
  const csrfRes = await fetch(`${BASE_URL}/api/auth/csrf`, { headers: extra });
  const jar = cookiesFrom(csrfRes);
  const { csrfToken } = (await csrfRes.json()) as { csrfToken: string };
  const res = await fetch(`${BASE_URL}/api/auth/callback/credentials`, {
    method: "POST",
    redirect: "manual",
    headers: {
      ...extra,
      "content-type": "application/x-www-form-urlencoded",
      cookie: cookieHeader(jar),
      origin: BASE_URL,
    },
    body: new URLSearchParams({ csrfToken, email, password, callbackUrl: `${BASE_URL}/today`, json: "true" }).toString(),
  });
  const token = cookiesFrom(res).get(SESSION_COOKIE);
  let url: string | null = res.headers.get("location");
  if (!url && res.headers.get("content-type")?.includes("json")) url = ((await res.json()) as { url?: string }).url ?? null;
  return { ok: !!token, cookie: token ? `${SESSION_COOKIE}=${token}` : null, status: res.status, url };
}

export async function signInOrThrow(email: string, password: string): Promise<string> {
  const r = await signInHttp(email, password);
  if (!r.cookie) throw new Error(`sign-in as ${email} failed (status ${r.status}, ${r.url})`);
  return r.cookie;
}

/** Signs out through next-auth (which bumps the session version). */
export async function signOutHttp(cookie: string): Promise<number> {
  const csrfRes = await fetch(`${BASE_URL}/api/auth/csrf`, { headers: { cookie } });
  const jar = cookiesFrom(csrfRes);
  const { csrfToken } = (await csrfRes.json()) as { csrfToken: string };
  const res = await fetch(`${BASE_URL}/api/auth/signout`, {
    method: "POST",
    redirect: "manual",
    headers: { "content-type": "application/x-www-form-urlencoded", cookie: `${cookie}; ${cookieHeader(jar)}`, origin: BASE_URL },
    body: new URLSearchParams({ csrfToken, json: "true" }).toString(),
  });
  return res.status;
}

/** Parses the RSC answer of a server action: line `1:` holds the action's return value. */
export function actionResultFromRsc(text: string): unknown {
  for (const line of text.split("\n")) {
    if (line.startsWith("1:")) return JSON.parse(line.slice(2));
  }
  return undefined;
}

/** Calls a server action over HTTP the way the browser does, posting to a page that uses it. */
export async function callAction(opts: {
  actionId: string;
  pagePath: string;
  args: unknown[];
  cookie?: string | null;
  origin?: string | null;
}): Promise<Response> {
  const headers: Record<string, string> = {
    "Next-Action": opts.actionId,
    "Content-Type": "text/plain;charset=UTF-8",
    Accept: "text/x-component",
  };
  if (opts.origin !== null) headers.Origin = opts.origin ?? BASE_URL;
  if (opts.cookie) headers.cookie = opts.cookie;
  return fetch(`${BASE_URL}${opts.pagePath}`, { method: "POST", redirect: "manual", headers, body: JSON.stringify(opts.args) });
}
