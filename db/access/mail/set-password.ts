import "server-only";
import { createHash, randomBytes } from "node:crypto";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { now } from "@/lib/clock";
import { hashPassword, passwordProblem } from "@/lib/auth/password";
import { appLink } from "@/lib/mail/compose";

export const SET_PASSWORD_LINK_DAYS = 7;
const TOKEN_SHAPE = /^[A-Za-z0-9_-]{43}$/;

function hashOf(token: string): string {
  return createHash("sha256").update(token).digest("hex");
}

/**
 * Makes a one-time set-password link for a person (for invitations), in the caller's
 * transaction. Only the token's hash is stored; the link expires after 7 days.
 */
export async function createSetPasswordLink(t: Transaction | null, personId: string): Promise<{ url: string; expiresAt: Date }> {
  const token = randomBytes(32).toString("base64url");
  const expiresAt = new Date(now().getTime() + SET_PASSWORD_LINK_DAYS * 24 * 3600 * 1000);
  await sequelize.query(`INSERT INTO set_password_tokens (person_id, token_hash, expires_at) VALUES (:p, :h, :e)`, {
    replacements: { p: personId, h: hashOf(token), e: expiresAt },
    transaction: t ?? undefined,
  });
  return { url: appLink(`/set-password/${token}`), expiresAt };
}

export type TokenState = { state: "valid"; name: string; email: string } | { state: "used" | "expired" | "unknown" };

/** Reads a link's state without changing anything (the page's GET). */
export async function inspectSetPasswordToken(token: string): Promise<TokenState> {
  if (!TOKEN_SHAPE.test(token)) return { state: "unknown" };
  const [row] = await sequelize.query<{ used_at: Date | null; expires_at: Date; name: string; email: string; active: boolean }>(
    `SELECT s.used_at, s.expires_at, p.name, p.email, p.active FROM set_password_tokens s JOIN people p ON p.id = s.person_id WHERE s.token_hash = :h`,
    { replacements: { h: hashOf(token) }, type: QueryTypes.SELECT },
  );
  if (!row || !row.active) return { state: "unknown" };
  if (row.used_at) return { state: "used" };
  if (row.expires_at.getTime() <= now().getTime()) return { state: "expired" };
  return { state: "valid", name: row.name, email: row.email };
}

export type SetPasswordResult = { ok: true } | { ok: false; field: "token" | "password"; message: string };

/**
 * Sets the password once: the token row is locked, checked (unused, unexpired, active
 * person) and marked used in the same transaction as the new hash, so a second use of
 * the same link is refused even when two submits race.
 */
export async function redeemSetPasswordToken(token: string, password: string): Promise<SetPasswordResult> {
  const problem = passwordProblem(password);
  if (problem) return { ok: false, field: "password", message: problem };
  if (!TOKEN_SHAPE.test(token)) return { ok: false, field: "token", message: "This link is not valid." };
  const hash = await hashPassword(password);
  return sequelize.transaction(async (t) => {
    const [row] = await sequelize.query<{ id: string; person_id: string; used_at: Date | null; expires_at: Date; active: boolean }>(
      `SELECT s.id, s.person_id, s.used_at, s.expires_at, p.active FROM set_password_tokens s JOIN people p ON p.id = s.person_id
       WHERE s.token_hash = :h FOR UPDATE OF s`,
      { replacements: { h: hashOf(token) }, type: QueryTypes.SELECT, transaction: t },
    );
    if (!row || !row.active) return { ok: false as const, field: "token" as const, message: "This link is not valid." };
    if (row.used_at) return { ok: false as const, field: "token" as const, message: "This link has already been used." };
    if (row.expires_at.getTime() <= now().getTime())
      return { ok: false as const, field: "token" as const, message: "This link has expired. Ask the school for a new one." };
    await sequelize.query(`UPDATE set_password_tokens SET used_at = :at WHERE id = :id`, {
      replacements: { at: now(), id: row.id },
      transaction: t,
    });
    // any other open link for the same person stops working too
    await sequelize.query(`UPDATE set_password_tokens SET used_at = :at WHERE person_id = :p AND used_at IS NULL`, {
      replacements: { at: now(), p: row.person_id },
      transaction: t,
    });
    await sequelize.query(
      `UPDATE people SET password_hash = :hash, session_version = session_version + 1, updated_at = now() WHERE id = :p`,
      {
        replacements: { hash, p: row.person_id },
        transaction: t,
      },
    );
    return { ok: true as const };
  });
}
