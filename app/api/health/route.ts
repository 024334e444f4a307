// GET /api/health: is the app up and can it reach its database? Public by design.
import { NextResponse } from "next/server";
import { sequelize } from "@/db/index";

export const dynamic = "force-dynamic";

export async function GET() {
  try {
    await sequelize.query("SELECT 1");
    return NextResponse.json({ status: "ok", database: "ok" });
  } catch {
    return NextResponse.json({ status: "degraded", database: "unreachable" }, { status: 503 });
  }
}
