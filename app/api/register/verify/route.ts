// GET /api/register/verify: walks the school's audit hash chain in the database and reports the first broken link.
import { NextResponse } from "next/server";
import { route } from "@/lib/http/api";
import { verifyChain } from "@/db/access/records/audit-chain";

export const GET = route("audit.verify", async ({ user }) => {
  const v = await verifyChain(user.schoolId);
  return NextResponse.json(v, { headers: { "Cache-Control": "no-store" } });
});
