// GET /api/register/verify: the audit hash chain verified from the school's checkpoint (up to 20,000 events written since the last verified position are walked now, the checkpoint moves to where that got, `unchecked` counts the rest) plus the latest full walk; a GET never walks the whole chain (ask for a full walk on the chain page, /register/chain).
import { NextResponse } from "next/server";
import { route } from "@/lib/http/api";
import { verifyChainSinceCheckpoint } from "@/db/access/records/audit-chain";
import { latestWalk } from "@/db/access/records/audit-walks";
import { CHAIN_PAGE_CHECK_LIMIT } from "@/db/access/records/chain-page";
import { walkView } from "@/lib/records/audit-walk-view";

export const GET = route("audit.verify", async ({ user }) => {
  const v = await verifyChainSinceCheckpoint(user.schoolId, { maxEvents: CHAIN_PAGE_CHECK_LIMIT });
  const walk = await latestWalk(user.schoolId);
  return NextResponse.json(
    {
      ok: v.ok,
      checked: v.checked,
      headHash: v.headHash,
      broken: v.broken,
      since: v.since,
      sinceVerifiedAt: v.sinceVerifiedAt?.toISOString() ?? null,
      unchecked: v.unchecked,
      latestWalk: walk ? walkView(walk) : null,
    },
    { headers: { "Cache-Control": "no-store" } },
  );
});
