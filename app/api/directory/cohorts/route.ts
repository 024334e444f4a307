// GET /api/directory/cohorts?q=&purpose=: up to 20 cohorts (by name) for a form's search picker.
import { NextResponse } from "next/server";
import { route, parseQuery } from "@/lib/http/api";
import { cohortPickerQuery } from "@/lib/directory/picker";
import { searchCohorts } from "@/db/access/directory/cohorts";

export const dynamic = "force-dynamic";

// people.view lets only staff in; the purpose's own permission (the form's) is asked by searchCohorts
export const GET = route("people.view", async ({ req, user }) => {
  const q = parseQuery(req, cohortPickerQuery);
  return NextResponse.json(await searchCohorts(user, q.purpose, q.q), { headers: { "Cache-Control": "private, no-store" } });
});
