import "server-only";
import { z } from "zod";
import {
  lockIdempotencyKey,
  priorIdempotentResult,
  storeIdempotentResult,
  withTransaction,
  type Transaction,
} from "@/db/access/shared/transaction";
import { HttpError, requirePermission } from "@/lib/auth/guard";
import type { CurrentUser } from "@/lib/auth/session";
import type { Permission } from "@/lib/auth/permissions";
import { findUnsafeText } from "@/lib/validation/text";
import { fieldLabel, installUserWords, userMessage } from "@/lib/validation/messages";

installUserWords();

/**
 * `message` is for people ("Due date: must be today or later"); `field` names the input key at
 * fault ("dueOn") and `fieldErrors` holds each key's messages without the label.
 */
export type ActionFailure = {
  ok: false;
  status: 400 | 401 | 403 | 404 | 409 | 422 | 429;
  message: string;
  field?: string;
  fieldErrors?: Record<string, string[]>;
};
export type ActionResult<T> = { ok: true; data: T; replayed?: boolean } | ActionFailure;

export interface ActionContext {
  user: CurrentUser;
  t: Transaction;
}

const idempotencyKey = z
  .string()
  .min(8)
  .max(100)
  .regex(/^[A-Za-z0-9_-]+$/);

function fieldErrorsOf(err: z.ZodError): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  for (const issue of err.issues) {
    const key = issue.path.map(String).join(".") || "form";
    (out[key] ??= []).push(issue.message);
  }
  return out;
}

/** The first field at fault, in words for the screen and by key for code. */
function firstFieldError(fieldErrors: Record<string, string[]>): { message: string; field?: string } {
  const first = Object.entries(fieldErrors)[0];
  if (!first) return { message: "Something in the form is not right: check it and try again" };
  return { message: `${fieldLabel(first[0])}: ${first[1][0]}`, field: first[0] };
}

/**
 * The one way a server action runs: permission first, then zod, then the work in one
 * transaction. Expected failures come back as `{ ok: false, status, message, fieldErrors }`;
 * nothing is written unless everything succeeds. With `idempotent: "scope"`, an input field
 * `idempotencyKey` makes a retried submit return the first result instead of creating twice.
 */
export async function runAction<S extends z.ZodType, T>(
  permission: Permission,
  schema: S,
  input: unknown,
  work: (data: z.output<S>, ctx: ActionContext) => Promise<T>,
  options: { idempotent?: string } = {},
): Promise<ActionResult<T>> {
  let user: CurrentUser;
  try {
    user = await requirePermission(permission);
  } catch (e) {
    if (e instanceof HttpError) return { ok: false, status: e.status as 401 | 403, message: e.message };
    throw e;
  }
  const unsafe = findUnsafeText(input);
  if (unsafe) {
    const fieldErrors = { [unsafe.field]: [unsafe.message] };
    return { ok: false, status: 400, ...firstFieldError(fieldErrors), fieldErrors };
  }
  const parsed = schema.safeParse(input);
  if (!parsed.success) {
    const fieldErrors = fieldErrorsOf(parsed.error);
    return { ok: false, status: 400, ...firstFieldError(fieldErrors), fieldErrors };
  }
  let key: string | null = null;
  if (options.idempotent) {
    const raw = (input as { idempotencyKey?: unknown } | null)?.idempotencyKey;
    if (raw !== undefined) {
      const k = idempotencyKey.safeParse(raw);
      if (!k.success)
        return {
          ok: false,
          status: 400,
          message: "The form is out of date: reload the page and try again",
          field: "idempotencyKey",
          fieldErrors: { idempotencyKey: ["invalid"] },
        };
      key = k.data;
    }
  }
  try {
    return await withTransaction(async (t) => {
      if (key) {
        // Serialise retries of the same key; the second waits and then sees the first result.
        await lockIdempotencyKey(t, user.id, key);
        const prior = await priorIdempotentResult<T>(t, user.id, key);
        if (prior) {
          if (prior.scope !== options.idempotent)
            throw new HttpError(409, "idempotencyKey: already used for another action", "idempotencyKey");
          return { ok: true as const, data: prior.result.data, replayed: true };
        }
      }
      const data = await work(parsed.data, { user, t });
      if (key) await storeIdempotentResult(t, user.id, key, options.idempotent!, data);
      return { ok: true as const, data };
    });
  } catch (e) {
    if (e instanceof HttpError) {
      const own = e.field && e.message.startsWith(`${e.field}: `) ? e.message.slice(e.field.length + 2) : e.message;
      return {
        ok: false,
        status: e.status as ActionFailure["status"],
        message: userMessage(e.message, e.field),
        ...(e.field ? { field: e.field, fieldErrors: { [e.field]: [own] } } : {}),
      };
    }
    if (e instanceof z.ZodError) {
      const fieldErrors = fieldErrorsOf(e);
      return { ok: false, status: 400, ...firstFieldError(fieldErrors), fieldErrors };
    }
    throw e;
  }
}
