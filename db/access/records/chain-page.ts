import "server-only";
import { verifyChainSinceCheckpoint, listAuditEvents } from "./audit-chain";
import { latestWalk } from "./audit-walks";
import { getSchool } from "../shared/school";

/** Positions after the checkpoint a visit checks at most (about 1 s of the database's time). */
export const CHAIN_PAGE_CHECK_LIMIT = 20_000;

/**
 * What a visit of the chain page reads: the events written since the checkpoint are checked now
 * (at most `maxEvents` of them; the checkpoint moves to where the check got when they link up), the latest full walk is read from
 * audit_walks, and the newest 30 events. Never a walk of the whole chain: that is asked for with
 * the page's button and runs in the background worker (audit-walks.ts).
 */
export async function chainPageData(schoolId: string, { maxEvents = CHAIN_PAGE_CHECK_LIMIT }: { maxEvents?: number } = {}) {
  const [v, walk, events, school] = await Promise.all([
    verifyChainSinceCheckpoint(schoolId, { maxEvents }),
    latestWalk(schoolId),
    listAuditEvents(schoolId, { limit: 30 }),
    getSchool(schoolId),
  ]);
  return { v, walk, events, school };
}
