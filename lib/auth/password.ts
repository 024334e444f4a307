import bcrypt from "bcryptjs";

export const BCRYPT_COST = 11;
export const MAX_PASSWORD_BYTES = 72;
export const MIN_PASSWORD_LENGTH = 10;

/** bcrypt reads at most 72 bytes; longer passwords are refused, never silently truncated. */
export function passwordProblem(password: string): string | null {
  if (Buffer.byteLength(password, "utf8") > MAX_PASSWORD_BYTES) return `Password must be at most ${MAX_PASSWORD_BYTES} bytes`;
  if (password.length < MIN_PASSWORD_LENGTH) return `Password must be at least ${MIN_PASSWORD_LENGTH} characters`;
  return null;
}

export async function hashPassword(password: string): Promise<string> {
  const problem = passwordProblem(password);
  if (problem) throw new Error(problem);
  return bcrypt.hash(password, BCRYPT_COST);
}

// A real hash of a random string, compared against when the account is unknown or locked,
// so the response time does not tell whether an e-mail exists. Made on first use, not when the
// module loads (every process that imports this file would otherwise pay for one hash).
let dummyHash: Promise<string> | undefined;
const dummy = () => (dummyHash ??= bcrypt.hash("chalkwing-timing-equaliser-" + Math.random(), BCRYPT_COST));

export async function verifyPassword(password: string, hash: string | null | undefined): Promise<boolean> {
  if (Buffer.byteLength(password, "utf8") > MAX_PASSWORD_BYTES) {
    await bcrypt.compare("x", await dummy());
    return false;
  }
  if (!hash) {
    await bcrypt.compare(password, await dummy());
    return false;
  }
  return bcrypt.compare(password, hash);
}
