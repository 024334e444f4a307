// Floods: a burst of moves of one session mails each attendee once (change notices coalesce per
// session and person), a cancellation replaces unsent move notices, and one person's creates are
// capped per minute.
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { makeSchool, closeDb } from "@/tests/helpers/factories";
import { scheduleSession } from "@/db/access/timetable/schedule-session";
import { rescheduleSession } from "@/db/access/timetable/reschedule-session";
import { cancelSession } from "@/db/access/timetable/cancel-session";
import { scheduleSessionSchema } from "@/lib/timetable/schema";
import { fixedClock, resetClock } from "@/lib/clock";
import { HttpError } from "@/lib/http/errors";
import { makeBriefing, count, addRooms } from "../timetable/helpers";

afterAll(async () => {
  resetClock();
  await closeDb();
});

type School = Awaited<ReturnType<typeof makeSchool>>;
let s: School;
let briefing: { id: string };

beforeAll(async () => {
  s = await makeSchool("flood");
  await addRooms(s, ["Flood room", "Cap room"]);
  briefing = await makeBriefing(s, "Power required and the back of the drag curve", ["AER-01"]);
});

function input(over: Partial<Record<string, unknown>>) {
  return scheduleSessionSchema.parse({
    briefingId: briefing.id,
    date: "2026-11-16",
    time: "09:00",
    durationMinutes: 60,
    room: "Flood room",
    instructorId: s.people.instructor.id,
    cohortId: "",
    studentIds: [],
    ...over,
  });
}

const pad = (n: number) => String(n).padStart(2, "0");

interface Row {
  id: string;
  kind: string;
  state: string;
  recipient_id: string;
  due_at: Date;
  superseded_by: string | null;
  facts: { heardStartsAt?: string };
}
const rowsFor = (sessionId: string) =>
  sequelize.query<Row>(
    `SELECT id, kind, state, recipient_id, due_at, superseded_by, coalesce_facts AS facts FROM outbox
      WHERE idempotency_key LIKE :a OR idempotency_key LIKE :b ORDER BY created_at`,
    { replacements: { a: `session.rescheduled:${sessionId}:%`, b: `session.cancelled:${sessionId}:%` }, type: QueryTypes.SELECT },
  );

describe("a burst of changes to one session", () => {
  it("20 moves in half a second leave one queued notice per attendee, due after the settle window, saying the time first known", async () => {
    const clock = fixedClock(new Date("2026-10-01T08:00:00Z"));
    const a = await sequelize.transaction((t) => scheduleSession(s.as.chief, input({ cohortId: s.cohorts.a.id }), t));
    const firstStart = a.startsAt.toISOString();
    for (let i = 1; i <= 20; i++) {
      clock.advanceMs(25);
      await sequelize.transaction((t) =>
        rescheduleSession(
          s.as.chief,
          {
            sessionId: a.id,
            date: "2026-11-16",
            time: `${pad(10 + Math.floor(i / 6))}:${pad((i % 6) * 10)}`,
            durationMinutes: 45,
            room: "Flood room",
            instructorId: s.people.instructor.id,
          },
          t,
        ),
      );
    }
    const lastChange = new Date("2026-10-01T08:00:00.500Z");
    const rows = await rowsFor(a.id);
    expect(rows).toHaveLength(60); // 20 moves x 3 attendees: every notice is kept, none deleted
    const queued = rows.filter((r) => r.state === "queued");
    expect(queued).toHaveLength(3);
    expect(new Set(queued.map((r) => r.recipient_id)).size).toBe(3);
    for (const q of queued) {
      expect(new Date(q.due_at).getTime()).toBe(lastChange.getTime() + 60_000);
      expect(q.facts.heardStartsAt).toBe(firstStart);
    }
    // each replaced notice points at a later notice for the same person
    const byId = new Map(rows.map((r) => [r.id, r]));
    const replaced = rows.filter((r) => r.state === "cancelled");
    expect(replaced).toHaveLength(57);
    for (const r of replaced) expect(byId.get(r.superseded_by!)?.recipient_id).toBe(r.recipient_id);
    // the worker's hand-over takes only rows whose due time has passed
    const due = (at: Date) =>
      count(`SELECT count(*)::int AS n FROM outbox WHERE school_id = :s AND state = 'queued' AND due_at <= :at`, {
        s: s.school.id,
        at,
      });
    expect(await due(new Date(lastChange.getTime() + 59_000))).toBe(0);
    expect(await due(new Date(lastChange.getTime() + 60_000))).toBe(3);
  });

  it("a sent notice is never replaced, and a cancellation replaces unsent moves and goes at once", async () => {
    const clock = fixedClock(new Date("2026-10-02T08:00:00Z"));
    const a = await sequelize.transaction((t) => scheduleSession(s.as.chief, input({ date: "2026-11-17", cohortId: s.cohorts.a.id }), t));
    const move = (time: string) =>
      sequelize.transaction((t) =>
        rescheduleSession(
          s.as.chief,
          { sessionId: a.id, date: "2026-11-17", time, durationMinutes: 60, room: "Flood room", instructorId: s.people.instructor.id },
          t,
        ),
      );
    await move("10:00");
    // the worker sent the first notices
    await sequelize.query(`UPDATE outbox SET state = 'sent', sent_at = now() WHERE state = 'queued' AND idempotency_key LIKE :k`, {
      replacements: { k: `session.rescheduled:${a.id}:%` },
    });
    clock.advanceMs(1000);
    await move("11:00");
    clock.advanceMs(1000);
    await move("12:00");
    let rows = await rowsFor(a.id);
    expect(rows.filter((r) => r.state === "sent")).toHaveLength(3);
    const queued = rows.filter((r) => r.state === "queued");
    expect(queued).toHaveLength(3);
    // the attendees last heard of 10:00 (the sent notice), so that is what the pending one says it was
    for (const q of queued) expect(q.facts.heardStartsAt).toBe("2026-11-17T10:00:00.000Z");

    clock.advanceMs(1000);
    await sequelize.transaction((t) => cancelSession(s.as.chief, { sessionId: a.id, reason: "Simulator down" }, t));
    rows = await rowsFor(a.id);
    expect(rows.filter((r) => r.state === "sent")).toHaveLength(3);
    const left = rows.filter((r) => r.state === "queued");
    expect(left.map((r) => r.kind)).toEqual(["session.cancelled", "session.cancelled", "session.cancelled"]);
    for (const r of left) expect(new Date(r.due_at).getTime()).toBe(new Date("2026-10-02T08:00:03Z").getTime());
    const moves = rows.filter((r) => r.kind === "session.rescheduled" && r.state === "cancelled");
    expect(moves).toHaveLength(6);
    const cancelIds = new Set(left.map((r) => r.id));
    expect(moves.filter((m) => cancelIds.has(m.superseded_by!))).toHaveLength(3);
  });
});

describe("creates per person per minute", () => {
  it("refuses the 31st session a person schedules within a minute with a 429, and writes nothing for it", async () => {
    resetClock();
    const make = (i: number) =>
      sequelize.transaction((t) =>
        scheduleSession(
          s.as.instructor2,
          input({
            date: "2026-12-01",
            time: `${pad(6 + Math.floor(i / 2))}:${i % 2 ? "30" : "00"}`,
            durationMinutes: 15,
            room: "Cap room",
            instructorId: s.people.instructor2.id,
            studentIds: [s.people.students[5]!.id],
          }),
          t,
        ),
      );
    for (let i = 0; i < 30; i++) await make(i);
    const before = await count(`SELECT count(*)::int AS n FROM training_sessions WHERE created_by = :p`, { p: s.people.instructor2.id });
    expect(before).toBe(30);
    const refused = await make(30).catch((e: unknown) => e);
    expect(refused).toBeInstanceOf(HttpError);
    expect((refused as HttpError).status).toBe(429);
    expect((refused as HttpError).message).toMatch(/30 sessions in the last minute/);
    expect(await count(`SELECT count(*)::int AS n FROM training_sessions WHERE created_by = :p`, { p: s.people.instructor2.id })).toBe(30);
    // another person is not held back by it
    const other = await sequelize.transaction((t) =>
      scheduleSession(
        s.as.chief,
        input({ date: "2026-12-02", room: "Cap room", instructorId: s.people.instructor2.id, studentIds: [s.people.students[5]!.id] }),
        t,
      ),
    );
    expect(other.id).toBeTruthy();
  });
});
