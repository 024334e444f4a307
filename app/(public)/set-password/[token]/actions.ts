"use server";
import { z } from "zod";
import { redeemSetPasswordToken } from "@/db/access/mail/set-password";
import type { ActionResult } from "@/lib/actions/run-action";

const schema = z.object({
  token: z.string().min(1, "missing").max(200, "too long"),
  password: z.string().max(500, "too long"),
  confirm: z.string().max(500, "too long"),
});

/**
 * Public by design: the one-time token is the credential. Sets the password once; the same
 * link is refused afterwards, and an expired or unknown link changes nothing.
 */
export async function setPasswordAction(input: unknown): Promise<ActionResult<{ done: true }>> {
  const parsed = schema.safeParse(input);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const field = issue?.path.map(String).join(".") || "form";
    return {
      ok: false,
      status: 400,
      message: `${field}: ${issue?.message ?? "invalid"}`,
      fieldErrors: { [field]: [issue?.message ?? "invalid"] },
    };
  }
  const { token, password, confirm } = parsed.data;
  if (password !== confirm)
    return { ok: false, status: 400, message: "confirm: the two passwords differ", fieldErrors: { confirm: ["The two passwords differ"] } };
  const res = await redeemSetPasswordToken(token, password);
  if (!res.ok) return { ok: false, status: 400, message: `${res.field}: ${res.message}`, fieldErrors: { [res.field]: [res.message] } };
  return { ok: true, data: { done: true } };
}
