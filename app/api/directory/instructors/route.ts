// GET /api/directory/instructors?q=&purpose=: up to 20 instructors (by name) for a form's search picker.
import { NextResponse } from "next/server";
import { route, parseQuery } from "@/lib/http/api";
import { instructorPickerQuery } from "@/lib/directory/picker";
import { searchInstructors } from "@/db/access/directory/instructors";

export const dynamic = "force-dynamic";

// people.view lets only staff in; the purpose's own permission (the form's) is asked by searchInstructors
export const GET = route("people.view", async ({ req, user }) => {
  const q = parseQuery(req, instructorPickerQuery);
  return NextResponse.json(await searchInstructors(user, q.purpose, q.q), { headers: { "Cache-Control": "private, no-store" } });
});
