// GET /api/health: is the app up and can it reach its database? Public by design.
import { NextResponse } from "next/server";
import { databaseReachable } from "@/db/access/shared/transaction";

export const dynamic = "force-dynamic";

export async function GET() {
  if (await databaseReachable()) return NextResponse.json({ status: "ok", database: "ok" });
  return NextResponse.json({ status: "degraded", database: "unreachable" }, { status: 503 });
}
