// GET /api/calendar/[token].ics: a person's Timetable as an iCalendar feed, behind a secret token (the token is the credential).
import type { NextRequest } from "next/server";
import { apiError, errorResponse } from "@/lib/http/api";
import { calendarFeed } from "@/db/access/timetable/calendar-feed";

export const dynamic = "force-dynamic";

// Calendar programs fetch this without a session cookie, so it cannot ask for a permission: the
// unguessable token in the path stands for the person, and an unknown or replaced token is 404.
export async function GET(_req: NextRequest, segment: { params: Promise<{ token: string }> }): Promise<Response> {
  try {
    const { token: raw } = await segment.params;
    const m = /^([A-Za-z0-9_-]{43})\.ics$/.exec(raw ?? "");
    if (!m) return apiError(404, "No such calendar");
    const text = await calendarFeed(m[1]!);
    if (text === null) return apiError(404, "No such calendar");
    return new Response(text, {
      status: 200,
      headers: {
        "content-type": "text/calendar; charset=utf-8",
        "content-disposition": 'inline; filename="timetable.ics"',
        "cache-control": "private, no-store",
        "x-content-type-options": "nosniff",
        "referrer-policy": "no-referrer",
      },
    });
  } catch (e) {
    return errorResponse(e);
  }
}
