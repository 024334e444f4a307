/**
 * The address a sign-in attempt is counted under. X-Forwarded-For is written by whoever sends
 * the request, so it is believed only when the operator says a reverse proxy in front of
 * Chalkwing overwrites it (CHALKWING_TRUSTED_PROXY=on), and then only its last entry, the one
 * that proxy appended. Without a trusted proxy every attempt counts under "direct": the lock
 * then covers the account from every address, which a forged header cannot escape.
 */
export function clientAddress(
  headers: Record<string, string | string[] | undefined> | undefined,
  trustedProxy = process.env.CHALKWING_TRUSTED_PROXY === "on",
): string {
  if (!trustedProxy) return "direct";
  const raw = headers?.["x-forwarded-for"];
  const value = Array.isArray(raw) ? raw[raw.length - 1] : raw;
  const last = value
    ?.split(",")
    .map((s) => s.trim())
    .filter(Boolean)
    .pop();
  return last && last.length <= 64 ? last : "unknown";
}
