// GET /api/progress/[studentId]: a student's Progress map as JSON, scoped to the caller (404 when not theirs to see).
import { NextResponse } from "next/server";
import { route, uuidParam } from "@/lib/http/api";
import { HttpError } from "@/lib/http/errors";
import { progressFor } from "@/db/access/records/progress-map";

export const GET = route<{ studentId: string }>("progress.view", async ({ user, params }) => {
  if (!uuidParam.safeParse(params.studentId).success) throw new HttpError(404, "studentId: no such student", "studentId");
  const map = await progressFor(user, params.studentId);
  return NextResponse.json(map, { headers: { "Cache-Control": "no-store" } });
});
