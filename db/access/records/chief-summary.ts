import "server-only";
import { differenceInCalendarDays } from "date-fns";
import type { CurrentUser } from "@/lib/auth/session";
import { now } from "@/lib/clock";
import { stagesWaiting } from "./stages-waiting";
import { recentWatchNotes } from "./sign-off-register";
import { verifyChainSinceCheckpoint } from "./audit-chain";

/**
 * The chief's Today: stage checks waiting (and since when, one aggregate query), the recent watch
 * notes (a bounded read of the latest records, never the whole register), and
 * the chain's status verified from its checkpoint (only the events written since the last check).
 */
export async function chiefRecordsSummary(user: CurrentUser) {
  const waiting = (await stagesWaiting(user)).map((w) => ({
    ...w,
    days: w.since ? differenceInCalendarDays(now(), w.since) : null,
  }));
  waiting.sort((a, b) => (b.days ?? 0) - (a.days ?? 0));
  const notes = await recentWatchNotes(user);
  const chain = await verifyChainSinceCheckpoint(user.schoolId);
  return { waiting, notes, chain };
}
