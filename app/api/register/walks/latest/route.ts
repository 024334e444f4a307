// GET /api/register/walks/latest: the school's newest full walk of the audit chain (state, checked of total, result), or null; polled by the chain page while a walk runs.
import { NextResponse } from "next/server";
import { route } from "@/lib/http/api";
import { latestWalk } from "@/db/access/records/audit-walks";
import { walkView } from "@/lib/records/audit-walk-view";

export const GET = route("audit.verify", async ({ user }) => {
  const walk = await latestWalk(user.schoolId);
  return NextResponse.json({ walk: walk ? walkView(walk) : null }, { headers: { "Cache-Control": "no-store" } });
});
