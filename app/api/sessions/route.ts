// GET /api/sessions: the Timetable's list view: sessions the caller may see, filtered, sorted and paginated on the server.
import { NextResponse } from "next/server";
import { route, parseQuery } from "@/lib/http/api";
import { HttpError } from "@/lib/http/errors";
import { listSessions } from "@/db/access/timetable/list-sessions";
import { getSchool } from "@/db/access/shared/school";
import { sessionsQuerySchema, SESSIONS_QUERY_KEYS } from "@/lib/timetable/schema";
import { zonedInstant } from "@/lib/time";

export const dynamic = "force-dynamic";

export const GET = route("timetable.view", async ({ req, user }) => {
  for (const key of new URL(req.url).searchParams.keys()) {
    // a parameter with no name ("?=x") is named "query", so the error still names a field
    if (!SESSIONS_QUERY_KEYS.includes(key))
      throw new HttpError(400, key ? `${key}: unknown parameter` : "query: a parameter without a name", key || "query");
  }
  const q = parseQuery(req, sessionsQuerySchema);
  if (q.from && q.to && q.to < q.from) throw new HttpError(400, "to: must not be before from", "to");
  const school = await getSchool(user.schoolId);
  const { rows, total } = await listSessions(
    user,
    {
      instructor: q.instructor,
      cohort: q.cohort,
      room: q.room,
      mine: q.mine,
      status: q.status,
      fromInstant: q.from ? zonedInstant(q.from, "00:00", school.timeZone) : undefined,
      // `to` is inclusive: up to the end of that day in the school's time zone
      toInstant: q.to ? new Date(zonedInstant(q.to, "00:00", school.timeZone).getTime() + 24 * 3600_000) : undefined,
    },
    { sort: q.sort, dir: q.dir, page: q.page, pageSize: q.pageSize },
    school,
  );
  return NextResponse.json({ rows, total, page: q.page, pageSize: q.pageSize, pages: Math.max(1, Math.ceil(total / q.pageSize)) });
});
