import ical from "node-ical";
import { QueryTypes } from "sequelize";
import { NextRequest } from "next/server";
import { sequelize } from "@/db/index";
import { makeSchool, closeDb } from "@/tests/helpers/factories";
import { scheduleSession } from "@/db/access/timetable/schedule-session";
import { rescheduleSession } from "@/db/access/timetable/reschedule-session";
import { cancelSession } from "@/db/access/timetable/cancel-session";
import { resetCalendarToken } from "@/db/access/timetable/calendar-feed";
import { scheduleSessionSchema } from "@/lib/timetable/schema";
import { GET } from "@/app/api/calendar/[token]/route";
import { setClock, resetClock } from "@/lib/clock";
import { makeBriefing, addRooms } from "./helpers";

afterAll(async () => {
  resetClock();
  await closeDb();
});

type School = Awaited<ReturnType<typeof makeSchool>>;
let s: School;
beforeAll(async () => {
  s = await makeSchool("ics");
  await addRooms(s, ["Briefing room 2", "Elsewhere"]);
  setClock(() => new Date("2026-11-01T12:00:00Z"));
});

async function fetchFeed(path: string) {
  const token = path.split("/").pop()!;
  const res = await GET(new NextRequest(`http://127.0.0.1${path}`), { params: Promise.resolve({ token }) });
  return { status: res.status, type: res.headers.get("content-type"), text: await res.text() };
}

function events(text: string) {
  return Object.values(ical.sync.parseICS(text)).filter((c): c is ical.VEvent => c?.type === "VEVENT");
}

describe("the personal iCalendar feed", () => {
  it("parses with node-ical; UID is stable, SEQUENCE grows with each change, a cancelled session stays as CANCELLED", async () => {
    const b = await makeBriefing(s, "Pressure and density altitude", ["ATM-02"]);
    const input = scheduleSessionSchema.parse({
      briefingId: b.id,
      date: "2026-11-10",
      time: "09:00",
      durationMinutes: 60,
      room: "Briefing room 2",
      instructorId: s.people.instructor.id,
      cohortId: s.cohorts.a.id,
    });
    const a = await sequelize.transaction((t) => scheduleSession(s.as.instructor, input, t));
    const other = await sequelize.transaction((t) => scheduleSession(s.as.instructor, { ...input, date: "2026-11-12" }, t));
    const notMine = await sequelize.transaction((t) =>
      scheduleSession(
        s.as.chief,
        { ...input, date: "2026-11-12", instructorId: s.people.instructor2.id, cohortId: s.cohorts.b.id, room: "Elsewhere" },
        t,
      ),
    );
    actAsNobody();
    const { path } = await sequelize.transaction((t) => resetCalendarToken(s.as.student, t));

    let feed = await fetchFeed(path);
    expect(feed.status).toBe(200);
    expect(feed.type).toMatch(/^text\/calendar/);
    let ev = events(feed.text);
    expect(ev.map((e) => e.uid).sort()).toEqual([`${a.id}@sessions.chalkwing.test`, `${other.id}@sessions.chalkwing.test`].sort());
    expect(ev.some((e) => e.uid.startsWith(notMine.id))).toBe(false);
    const first = ev.find((e) => e.uid.startsWith(a.id))!;
    expect(Number(first.sequence)).toBe(0);
    expect(first.start.toISOString()).toBe("2026-11-10T09:00:00.000Z");
    expect(first.location).toBe("Briefing room 2");

    await sequelize.transaction((t) =>
      rescheduleSession(
        s.as.instructor,
        {
          sessionId: a.id,
          date: "2026-11-10",
          time: "11:00",
          durationMinutes: 60,
          room: "Briefing room 2",
          instructorId: s.people.instructor.id,
        },
        t,
      ),
    );
    feed = await fetchFeed(path);
    ev = events(feed.text);
    const moved = ev.find((e) => e.uid === first.uid)!;
    expect(Number(moved.sequence)).toBe(1);
    expect(moved.start.toISOString()).toBe("2026-11-10T11:00:00.000Z");

    await sequelize.transaction((t) => cancelSession(s.as.instructor, { sessionId: a.id, reason: "Room flooded" }, t));
    ev = events((await fetchFeed(path)).text);
    const cancelled = ev.find((e) => e.uid === first.uid)!;
    expect(cancelled.status).toBe("CANCELLED");
    expect(Number(cancelled.sequence)).toBe(2);
    expect(ev.find((e) => e.uid.startsWith(other.id))!.status).toBe("CONFIRMED");
  });

  it("a reset gives a new token, and the old URL answers 404; a made-up token is 404 too", async () => {
    const first = await sequelize.transaction((t) => resetCalendarToken(s.as.instructor, t));
    expect((await fetchFeed(first.path)).status).toBe(200);
    const second = await sequelize.transaction((t) => resetCalendarToken(s.as.instructor, t));
    expect(second.path).not.toBe(first.path);
    expect((await fetchFeed(first.path)).status).toBe(404);
    expect((await fetchFeed(second.path)).status).toBe(200);
    expect((await fetchFeed("/api/calendar/not-a-token.ics")).status).toBe(404);
    expect((await fetchFeed(second.path.replace(".ics", ""))).status).toBe(404);
    const [row] = await sequelize.query<{ token_hash: string }>(`SELECT token_hash FROM calendar_feeds WHERE person_id = :p`, {
      replacements: { p: s.people.instructor.id },
      type: QueryTypes.SELECT,
    });
    expect(row!.token_hash).toMatch(/^[0-9a-f]{64}$/);
    expect(row!.token_hash).not.toContain(second.token);
  });
});

function actAsNobody() {
  (globalThis as { __chalkwingTestUser?: unknown }).__chalkwingTestUser = null;
}
