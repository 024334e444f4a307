// GET /api/airframes: the school's aircraft profiles (add ?retired=include to list retired ones too).
import { NextResponse } from "next/server";
import { z } from "zod";
import { route, parseQuery } from "@/lib/http/api";
import { listAirframes } from "@/db/access/curve-lab/airframes";

export const dynamic = "force-dynamic";

const query = z.object({ retired: z.enum(["include", "exclude"], { error: 'retired must be "include" or "exclude"' }).optional() });

export const GET = route("airframes.view", async ({ req, user }) => {
  const q = parseQuery(req, query);
  const rows = await listAirframes(user.schoolId, { includeRetired: q.retired === "include" });
  return NextResponse.json({ rows: rows.map((r) => ({ ...r, primary: r.name })) });
});
