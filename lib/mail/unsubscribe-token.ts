import { createHmac, timingSafeEqual } from "node:crypto";

/** Kinds of mail a sponsor can stop, one student at a time. */
export const UNSUBSCRIBABLE = ["weekly.letter"] as const;
export type UnsubscribeKind = (typeof UNSUBSCRIBABLE)[number];

export interface UnsubscribeClaim {
  sponsorId: string;
  studentId: string;
  kind: UnsubscribeKind;
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/;

function secret(): string {
  const s = process.env.CHALKWING_SIGNING_SECRET || process.env.NEXTAUTH_SECRET;
  if (!s || s.length < 16) throw new Error("CHALKWING_SIGNING_SECRET (or NEXTAUTH_SECRET) is not set");
  return s;
}

function mac(payload: string): Buffer {
  return createHmac("sha256", secret()).update(`chalkwing-unsubscribe\n${payload}`).digest();
}

/** A token bound to one sponsor, one student and one kind of mail: `<payload>.<HMAC-SHA256>`, base64url. */
export function signUnsubscribe(claim: UnsubscribeClaim): string {
  const payload = `v1:${claim.sponsorId}:${claim.studentId}:${claim.kind}`;
  return `${Buffer.from(payload).toString("base64url")}.${mac(payload).toString("base64url")}`;
}

/** The claim of a genuine token, or null for anything forged, altered, swapped or malformed. */
export function verifyUnsubscribe(token: string): UnsubscribeClaim | null {
  if (typeof token !== "string" || token.length > 400) return null;
  const m = /^([A-Za-z0-9_-]+)\.([A-Za-z0-9_-]{43})$/.exec(token);
  if (!m) return null;
  const payload = Buffer.from(m[1]!, "base64url").toString("utf8");
  const given = Buffer.from(m[2]!, "base64url");
  const want = mac(payload);
  if (given.length !== want.length || !timingSafeEqual(given, want)) return null;
  const [v, sponsorId, studentId, kind] = payload.split(":");
  if (v !== "v1" || !sponsorId || !studentId || !UUID.test(sponsorId) || !UUID.test(studentId)) return null;
  if (!(UNSUBSCRIBABLE as readonly string[]).includes(kind ?? "")) return null;
  return { sponsorId, studentId, kind: kind as UnsubscribeKind };
}
