// GET /api/directory/endorsements?q=&kind=awaiting|remedial: up to 20 choices (by a part of the student's
// name, or of a remedial item's area) for the knowledge-test result forms, once they hold more than a list.
import { NextResponse } from "next/server";
import { route, parseQuery } from "@/lib/http/api";
import { endorsementPickerQuery } from "@/lib/directory/picker";
import { searchEndorsementChoices } from "@/db/access/endorsements/log";

export const dynamic = "force-dynamic";

export const GET = route("endorsements.results", async ({ req, user }) => {
  const q = parseQuery(req, endorsementPickerQuery);
  return NextResponse.json(await searchEndorsementChoices(user, q.kind, q.q), { headers: { "Cache-Control": "private, no-store" } });
});
