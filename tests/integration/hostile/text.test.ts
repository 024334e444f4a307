// NUL and lone surrogates in any field are a 400 naming the field (never a database error,
// never a silently replaced character), for server actions and route handlers alike.
import { randomUUID } from "node:crypto";
import { NextRequest } from "next/server";
import { GET as listSessionsRoute } from "@/app/api/sessions/route";
import { scheduleSessionAction, cancelSessionAction } from "@/app/(app)/timetable/actions";
import { actAs, closeDb, makeSchool } from "@/tests/helpers/factories";
import { makeBriefing, count, addRooms } from "../timetable/helpers";

jest.mock("next/cache", () => ({ revalidatePath: jest.fn() }));

let s: Awaited<ReturnType<typeof makeSchool>>;
let briefingId: string;
beforeAll(async () => {
  s = await makeSchool("hostile-text");
  await addRooms(s, ["Hangar classroom"]);
  briefingId = (await makeBriefing(s, "Gliding range", ["AER-01"])).id;
});
afterAll(async () => {
  actAs(null);
  await closeDb();
});

const sessionsOf = () => count(`SELECT count(*)::int AS n FROM training_sessions WHERE school_id = :s`, { s: s.school.id });
const input = (over: Record<string, unknown>) => ({
  briefingId,
  date: "2026-11-20",
  time: "09:00",
  durationMinutes: 60,
  room: "Hangar classroom",
  instructorId: s.people.instructor.id,
  cohortId: "",
  studentIds: [s.people.students[0]!.id],
  idempotencyKey: randomUUID(),
  ...over,
});

test.each([
  ["NUL", "Room\u0000 1", "must not contain a NUL character"],
  ["a lone high surrogate", "Room \uD83D", "must not contain a broken character (lone surrogate)"],
  ["a lone low surrogate", "\uDE00 Room", "must not contain a broken character (lone surrogate)"],
])("a room with %s is a 400 naming room, and no session is made", async (_label, room, message) => {
  actAs(s.as.chief);
  const before = await sessionsOf();
  const res = await scheduleSessionAction(input({ room }));
  expect(res).toMatchObject({ ok: false, status: 400, fieldErrors: { room: [message] } });
  expect(await sessionsOf()).toBe(before);
});

test("a cancel reason with NUL is a 400 naming reason (it used to reach PostgreSQL), and the session stays scheduled", async () => {
  actAs(s.as.chief);
  const made = await scheduleSessionAction(input({ time: "13:00" }));
  expect(made.ok).toBe(true);
  const id = (made as { data: { id: string } }).data.id;
  const res = await cancelSessionAction({ sessionId: id, reason: "ill\u0000ness", idempotencyKey: randomUUID() });
  expect(res).toMatchObject({ ok: false, status: 400, fieldErrors: { reason: ["must not contain a NUL character"] } });
  expect(await count(`SELECT count(*)::int AS n FROM training_sessions WHERE id = :id AND status = 'scheduled'`, { id })).toBe(1);
});

test("a query parameter with NUL is a 400 naming it", async () => {
  actAs(s.as.chief);
  const res = await listSessionsRoute(new NextRequest("http://localhost/api/sessions?room=A%00B"), { params: Promise.resolve({}) });
  expect(res.status).toBe(400);
  expect(await res.json()).toMatchObject({ error: { status: 400, field: "room" } });
});
