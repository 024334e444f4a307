import { NextResponse, type NextRequest } from "next/server";
import { getToken } from "next-auth/jwt";
import { refuseHostileAction } from "@/lib/http/action-guard";
import { newNonce, pageCsp } from "@/lib/http/csp";
import { safeNextPath } from "@/lib/validation/next-path";

// Runs before every page request and server action (not /api, not static files):
// 1. refuses hostile server-action requests (foreign/missing Origin, oversized, not JSON, too
//    deeply nested) with 403 / 413 / 400 before the framework sees them;
// 2. sets a per-request nonce in the Content-Security-Policy (request and response), which
//    Next.js puts on its own scripts;
// 3. redirects signed-out visitors to sign-in. Every page, action and handler still checks the
//    caller's permission itself on the server.

const SIGNED_OUT_PAGES = /^\/(sign-in|set-password|unsubscribe)(\/|$)/;

export default async function proxy(req: NextRequest): Promise<Response> {
  const refused = await refuseHostileAction(req);
  if (refused) return refused;

  const nonce = newNonce();
  const csp = pageCsp(nonce);

  if (!SIGNED_OUT_PAGES.test(req.nextUrl.pathname)) {
    const token = process.env.NEXTAUTH_SECRET ? await getToken({ req, secret: process.env.NEXTAUTH_SECRET }) : null;
    if (!token) {
      const signIn = new URL("/sign-in", req.nextUrl.origin);
      signIn.searchParams.set("next", safeNextPath(`${req.nextUrl.pathname}${req.nextUrl.search}`));
      const res = NextResponse.redirect(signIn);
      res.headers.set("Content-Security-Policy", csp);
      return res;
    }
  }

  const headers = new Headers(req.headers);
  headers.set("x-nonce", nonce);
  headers.set("Content-Security-Policy", csp);
  const res = NextResponse.next({ request: { headers } });
  res.headers.set("Content-Security-Policy", csp);
  return res;
}

export const config = {
  matcher: ["/((?!api/|_next/static|_next/image|favicon.ico|robots.txt).*)"],
};
