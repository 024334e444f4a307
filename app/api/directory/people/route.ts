// GET /api/directory/people?q=&role=: up to 20 accounts (by name) for the chief's account pickers (people.manage).
import { NextResponse } from "next/server";
import { route, parseQuery } from "@/lib/http/api";
import { peoplePickerQuery } from "@/lib/directory/picker";
import { searchPeople } from "@/db/access/directory/people";

export const dynamic = "force-dynamic";

export const GET = route("people.manage", async ({ req, user }) => {
  const q = parseQuery(req, peoplePickerQuery);
  return NextResponse.json(await searchPeople(user, q.role, q.q), { headers: { "Cache-Control": "private, no-store" } });
});
