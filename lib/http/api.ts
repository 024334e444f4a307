import "server-only";
import { NextResponse, type NextRequest } from "next/server";
import { z } from "zod";
import { HttpError, requirePermission } from "@/lib/auth/guard";
import { hasSessionCookie, type CurrentUser } from "@/lib/auth/session";
import type { Permission } from "@/lib/auth/permissions";
import { env } from "@/lib/env";
import { installUserWords } from "@/lib/validation/messages";

// zod issues a schema did not word itself read as plain English (the JSON still names the field)
installUserWords();
import { findUnsafeText } from "@/lib/validation/text";

/** One error shape for the whole API: `{ error: { status, message, field? } }`. */
export function apiError(status: number, message: string, field?: string) {
  return NextResponse.json({ error: { status, message, ...(field ? { field } : {}) } }, { status });
}

export function zodFieldError(err: z.ZodError): HttpError {
  const first = err.issues[0];
  const field = first?.path.map(String).join(".") || "body";
  return new HttpError(400, `${field}: ${first?.message ?? "invalid"}`, field);
}

const UNSAFE = new Set(["POST", "PUT", "PATCH", "DELETE"]);

/** A state-changing request that carries a session cookie must come from our own origin. */
export async function checkOrigin(req: Request): Promise<void> {
  if (!UNSAFE.has(req.method)) return;
  if (!(await hasSessionCookie())) return;
  const origin = req.headers.get("origin");
  const own = new URL(env().NEXTAUTH_URL).origin;
  const host = req.headers.get("host");
  const allowed = new Set([own, host ? `http://${host}` : "", host ? `https://${host}` : ""]);
  if (!origin || origin === "null" || !allowed.has(origin)) throw new HttpError(403, "Cross-site request refused", "origin");
}

export interface RouteContext<P> {
  req: NextRequest;
  user: CurrentUser;
  params: P;
}

/**
 * Wraps a route handler: checks the Origin of unsafe methods, asks for the permission,
 * maps expected failures to the API error shape, and hides unexpected ones behind a 500
 * without a stack trace.
 */
export function route<P = Record<string, string>>(permission: Permission, handler: (ctx: RouteContext<P>) => Promise<Response>) {
  return async (req: NextRequest, segment: { params: Promise<P> }): Promise<Response> => {
    try {
      await checkOrigin(req);
      const user = await requirePermission(permission);
      const params = (await segment?.params) ?? ({} as P);
      return await handler({ req, user, params });
    } catch (e) {
      return errorResponse(e);
    }
  };
}

export function errorResponse(e: unknown): Response {
  if (e instanceof HttpError) return apiError(e.status, e.message, e.field);
  if (e instanceof z.ZodError) {
    const h = zodFieldError(e);
    return apiError(h.status, h.message, h.field);
  }
  console.error("[api] unexpected error", e);
  return apiError(500, "Something went wrong on our side");
}

/** NUL or a lone surrogate anywhere in the input is a 400 naming the field (lib/validation/text.ts). */
function refuseUnsafeText(value: unknown): void {
  const unsafe = findUnsafeText(value);
  if (unsafe) throw new HttpError(400, `${unsafe.field}: ${unsafe.message}`, unsafe.field);
}

/** Query parameters validated with zod; a bad one is a 400 naming it. */
export function parseQuery<S extends z.ZodType>(req: Request, schema: S): z.output<S> {
  const url = new URL(req.url);
  const raw: Record<string, string> = {};
  url.searchParams.forEach((v, k) => {
    raw[k] = v;
  });
  refuseUnsafeText(raw);
  const r = schema.safeParse(raw);
  if (!r.success) throw zodFieldError(r.error);
  return r.data;
}

export async function parseJsonBody<S extends z.ZodType>(req: Request, schema: S): Promise<z.output<S>> {
  let body: unknown;
  try {
    body = await req.json();
  } catch {
    throw new HttpError(400, "body: not valid JSON", "body");
  }
  refuseUnsafeText(body);
  const r = schema.safeParse(body);
  if (!r.success) throw zodFieldError(r.error);
  return r.data;
}

export const uuidParam = z.string().uuid();
