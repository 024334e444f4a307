import "server-only";
import { differenceInCalendarDays } from "date-fns";
import type { CurrentUser } from "@/lib/auth/session";
import { now } from "@/lib/clock";
import { stagesWaitingTop } from "./stages-waiting";
import { recentWatchNotes } from "./sign-off-register";
import { verifyChainSinceCheckpoint } from "./audit-chain";

/**
 * How many audit events after the checkpoint the chief's Today checks a visit: a school writes far
 * fewer between two visits, so this bounds only a chain that fell far behind (an import, a
 * generated school), at about 0.2 s a visit, where the chain page checks up to 20,000 and the full
 * walk runs in the background.
 */
export const TODAY_CHAIN_CHECK_LIMIT = 5_000;

/** How many stage checks waiting the chief's Today names (those waiting longest); the rest are counted. */
export const TODAY_WAITING_SHOWN = 10;

/**
 * The chief's Today: how many stages wait for their check and the TODAY_WAITING_SHOWN waiting
 * longest (one aggregate query, counted and limited in SQL, whatever the size of the school), the
 * recent watch notes (a bounded read of the latest records, never the whole register), and the
 * chain's status verified from its checkpoint (only the events written since the last check, at
 * most TODAY_CHAIN_CHECK_LIMIT of them; `chain.unchecked` counts the rest).
 */
export async function chiefRecordsSummary(user: CurrentUser) {
  const { total: waitingTotal, top } = await stagesWaitingTop(user, TODAY_WAITING_SHOWN);
  const waiting = top.map((w) => ({ ...w, days: w.since ? differenceInCalendarDays(now(), w.since) : null }));
  const notes = await recentWatchNotes(user);
  const chain = await verifyChainSinceCheckpoint(user.schoolId, { maxEvents: TODAY_CHAIN_CHECK_LIMIT });
  return { waiting, waitingTotal, notes, chain };
}
