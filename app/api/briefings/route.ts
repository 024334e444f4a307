// GET /api/briefings: one page of the briefings the caller may read (sortable, filterable; bad parameters are a 400 naming them).
import { NextResponse } from "next/server";
import { route, parseQuery } from "@/lib/http/api";
import { listBriefings } from "@/db/access/briefings/list";
import { briefingListQuery } from "@/lib/briefings/schema";

export const dynamic = "force-dynamic";

export const GET = route("briefings.view", async ({ req, user }) => {
  const query = parseQuery(req, briefingListQuery);
  return NextResponse.json(await listBriefings(user, query));
});
