// GET /api/directory/students?q=&purpose=: up to 20 students (by name) for a form's search picker, within the caller's student scope for that form.
import { NextResponse } from "next/server";
import { route, parseQuery } from "@/lib/http/api";
import { studentPickerQuery } from "@/lib/directory/picker";
import { searchStudents } from "@/db/access/directory/students";

export const dynamic = "force-dynamic";

// people.view lets only staff in; the purpose's own permission (the form's) is asked by searchStudents
export const GET = route("people.view", async ({ req, user }) => {
  const q = parseQuery(req, studentPickerQuery);
  return NextResponse.json(await searchStudents(user, q.purpose, q.q), { headers: { "Cache-Control": "private, no-store" } });
});
