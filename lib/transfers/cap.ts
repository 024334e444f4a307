// Transfer credit caps (pure). A student who transfers in may be credited with ground time from
// the earlier school, but never more than a share of the course's ground training minimum:
// 14 CFR 141.77(c)(1): at most 50 percent when the earlier training was an approved (Part 141) course;
// 14 CFR 141.77(c)(2): at most 25 percent when it was not.
// Credits add up: every credit of the student on the course counts against the cap, and
// credits from courses that were not approved count against the 25 percent cap on their own.

export const APPROVED_SHARE = 0.5; // 14 CFR 141.77(c)(1)
export const NOT_APPROVED_SHARE = 0.25; // 14 CFR 141.77(c)(2)

/** The most ground minutes a transfer may credit (whole minutes, rounded down). */
export function transferCapMinutes(minimumMinutes: number, approved: boolean): number {
  if (!Number.isInteger(minimumMinutes) || minimumMinutes < 0) throw new RangeError("minimumMinutes: a whole number of minutes, 0 or more");
  return Math.floor(minimumMinutes * (approved ? APPROVED_SHARE : NOT_APPROVED_SHARE));
}

export interface PriorCredits {
  /** minutes already credited from approved courses */
  approvedMinutes: number;
  /** minutes already credited from courses that were not approved */
  notApprovedMinutes: number;
}

export type CapCheck = { ok: true; capMinutes: number } | { ok: false; capMinutes: number; roomMinutes: number; message: string };

/** Whether a new credit fits under the cap that applies to it, counting the student's earlier credits. */
export function checkTransferCredit(minimumMinutes: number, prior: PriorCredits, credit: { approved: boolean; minutes: number }): CapCheck {
  const capMinutes = transferCapMinutes(minimumMinutes, credit.approved);
  const counted = credit.approved ? prior.approvedMinutes + prior.notApprovedMinutes : prior.notApprovedMinutes;
  // an approved credit also may not lift the total over the 50 percent cap; a not-approved one stays within 25 percent
  const room = Math.max(0, capMinutes - counted);
  if (credit.minutes <= room) return { ok: true, capMinutes };
  const share = credit.approved ? "50%" : "25%";
  const kind = credit.approved ? "an approved course" : "a course that was not approved";
  const earlier = counted > 0 ? ` (${counted} already credited, ${room} left)` : "";
  return {
    ok: false,
    capMinutes,
    roomMinutes: room,
    message: `creditedMinutes: at most ${capMinutes} minutes can be credited from ${kind}, ${share} of the course's ${minimumMinutes}-minute ground training minimum${earlier} (14 CFR 141.77(c))`,
  };
}
