// Rooms: the school's managed list. Two spellings of one room are one room, so the database's
// double-booking constraint (on room_id, migration 0560) refuses them at the same time; the list
// is kept through server actions that check rooms.manage and name the field at fault.
import { randomUUID } from "node:crypto";
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { actAs, closeDb, makeSchool } from "@/tests/helpers/factories";
import { scheduleSession } from "@/db/access/timetable/schedule-session";
import { schedulingChoices } from "@/db/access/timetable/scheduling-choices";
import { scheduleSessionAction, rescheduleSessionAction } from "@/app/(app)/timetable/actions";
import { createRoomAction, updateRoomAction, setRoomActiveAction } from "@/app/(app)/rooms/actions";
import { scheduleSessionSchema } from "@/lib/timetable/schema";
import { HttpError } from "@/lib/http/errors";
import { makeBriefing, count, addRooms } from "./helpers";

jest.mock("next/cache", () => ({ revalidatePath: jest.fn() }));

type School = Awaited<ReturnType<typeof makeSchool>>;
let s: School;
let other: School;
let briefingId: string;

beforeAll(async () => {
  [s, other] = await Promise.all([makeSchool("rooms"), makeSchool("rooms-other")]);
  await addRooms(s, ["Hangar classroom", "Briefing room 2"]);
  await addRooms(other, ["Hangar classroom"]);
  briefingId = (await makeBriefing(s, "Power required and available", ["AER-01"])).id;
});
afterAll(async () => {
  actAs(null);
  await closeDb();
});

const roomsOf = (school: School) => count(`SELECT count(*)::int AS n FROM rooms WHERE school_id = :s`, { s: school.school.id });
const sessionsOf = () => count(`SELECT count(*)::int AS n FROM training_sessions WHERE school_id = :s`, { s: s.school.id });
async function roomId(school: School, name: string): Promise<string> {
  const [r] = await sequelize.query<{ id: string }>(`SELECT id FROM rooms WHERE school_id = :s AND name = :n`, {
    replacements: { s: school.school.id, n: name },
    type: QueryTypes.SELECT,
  });
  return r!.id;
}
const base = (over: Record<string, unknown>) => ({
  briefingId,
  date: "2026-11-16",
  time: "09:00",
  durationMinutes: 60,
  instructorId: s.people.instructor.id,
  cohortId: "",
  studentIds: [s.people.students[0]!.id],
  idempotencyKey: randomUUID(),
  ...over,
});

describe("two spellings of one room", () => {
  it('"hangar  classroom " and "Hangar classroom" at the same time: exactly one is booked, the other is a 409 naming room', async () => {
    const results = await Promise.allSettled([
      sequelize.transaction((t) => scheduleSession(s.as.chief, scheduleSessionSchema.parse(base({ room: "hangar  classroom " })), t)),
      sequelize.transaction((t) =>
        scheduleSession(
          s.as.chief,
          scheduleSessionSchema.parse(
            base({
              room: "Hangar classroom",
              time: "09:30",
              instructorId: s.people.instructor2.id,
              studentIds: [s.people.students[1]!.id],
            }),
          ),
          t,
        ),
      ),
    ]);
    expect(results.filter((r) => r.status === "fulfilled")).toHaveLength(1);
    const refused = results.filter((r): r is PromiseRejectedResult => r.status === "rejected");
    expect(refused).toHaveLength(1);
    expect(refused[0]!.reason).toBeInstanceOf(HttpError);
    expect(refused[0]!.reason).toMatchObject({ status: 409, field: "room" });
    expect((refused[0]!.reason as HttpError).message).toMatch(
      /^room: Hangar classroom is already booked for "Power required and available"/,
    );
    // both spellings are one room: the school's list did not grow
    expect(
      await count(`SELECT count(*)::int AS n FROM rooms WHERE school_id = :s AND name_key = 'hangar classroom'`, { s: s.school.id }),
    ).toBe(1);
  });

  it("the database itself refuses the second spelling, even from a writer that gives only the room's text", async () => {
    const insert = (room: string, start: string, instructor: string) =>
      sequelize.query(
        `INSERT INTO training_sessions (school_id, briefing_id, briefing_revision_id, starts_at, ends_at, room, instructor_id, created_by)
         SELECT :s, b.id, b.current_revision_id, :a::timestamptz, :a::timestamptz + interval '1 hour', :room, :i, :i FROM briefings b WHERE b.id = :b`,
        { replacements: { s: s.school.id, b: briefingId, a: start, room, i: instructor } },
      );
    await insert("Briefing room 2", "2026-11-17T09:00:00Z", s.people.instructor.id);
    await expect(insert("  BRIEFING\troom   2", "2026-11-17T09:30:00Z", s.people.instructor2.id)).rejects.toMatchObject({
      parent: { code: "23P01", constraint: "training_sessions_room_busy" },
    });
  });

  it("the same name at another school is another room", async () => {
    const [mine, theirs] = await Promise.all([roomId(s, "Hangar classroom"), roomId(other, "Hangar classroom")]);
    expect(mine).not.toBe(theirs);
  });
});

describe("booking by roomId", () => {
  it("the scheduling form's choices are the active rooms; a session booked by roomId carries the room's name", async () => {
    actAs(s.as.chief);
    const id = await roomId(s, "Briefing room 2");
    const res = await scheduleSessionAction(base({ roomId: id, date: "2026-11-18" }));
    expect(res).toMatchObject({ ok: true });
    const sid = (res as { data: { id: string } }).data.id;
    const [row] = await sequelize.query<{ room: string; roomId: string }>(
      `SELECT room, room_id AS "roomId" FROM training_sessions WHERE id = :id`,
      { replacements: { id: sid }, type: QueryTypes.SELECT },
    );
    expect(row).toEqual({ room: "Briefing room 2", roomId: id });
    const choices = await schedulingChoices(s.as.chief);
    expect(choices.roomChoices.map((r) => r.name)).toEqual(expect.arrayContaining(["Briefing room 2", "Hangar classroom"]));
  });

  it.each([
    ["a name not on the list", { room: "Boiler room" }, "room", /not a room of this school/],
    ["no room at all", {}, "roomId", /choose a room/],
    ["a roomId that is not an id", { roomId: "hangar" }, "roomId", /choose a room/],
    ["another school's room", { roomId: "OTHER" }, "roomId", /no such room at this school/],
    ["a name over 100 characters", { room: "x".repeat(101) }, "room", /at most 100 characters/],
  ])("%s is a 400 naming the field, and no session is made", async (_label, over, field, message) => {
    actAs(s.as.chief);
    const given = (over as { roomId?: string }).roomId === "OTHER" ? { roomId: await roomId(other, "Hangar classroom") } : over;
    const before = await sessionsOf();
    const res = await scheduleSessionAction(base({ ...given, date: "2026-11-19" }));
    expect(res).toMatchObject({ ok: false, status: 400, field });
    expect((res as { fieldErrors: Record<string, string[]> }).fieldErrors[field]![0]).toMatch(message);
    expect(await sessionsOf()).toBe(before);
  });
});

describe("the Rooms list (server actions)", () => {
  it("the chief adds a room; a retried submit with the same key adds nothing twice; another spelling of it is a 409 naming name", async () => {
    actAs(s.as.chief);
    const before = await roomsOf(s);
    const key = randomUUID();
    const first = await createRoomAction({ name: "  Simulator   bay ", capacity: "6", idempotencyKey: key });
    expect(first).toMatchObject({ ok: true, data: { name: "Simulator bay" } });
    const again = await createRoomAction({ name: "  Simulator   bay ", capacity: "6", idempotencyKey: key });
    expect(again).toMatchObject({ ok: true, replayed: true, data: { name: "Simulator bay" } });
    expect(await roomsOf(s)).toBe(before + 1);
    const dup = await createRoomAction({ name: "SIMULATOR BAY", idempotencyKey: randomUUID() });
    expect(dup).toMatchObject({ ok: false, status: 409, field: "name" });
    expect(await roomsOf(s)).toBe(before + 1);
  });

  it.each([
    ["an empty name", { name: "   " }, "name", "required"],
    ["a name over 100 characters", { name: "y".repeat(101) }, "name", "at most 100 characters"],
    ["no seats", { name: "Annex", capacity: "0" }, "capacity", "at least 1"],
    ["seats that are not whole", { name: "Annex", capacity: "2.5" }, "capacity", "a whole number"],
  ])("adding a room with %s is a 400 naming the field; nothing is added", async (_label, input, field, message) => {
    actAs(s.as.chief);
    const before = await roomsOf(s);
    const res = await createRoomAction({ ...input, idempotencyKey: randomUUID() });
    expect(res).toMatchObject({ ok: false, status: 400, field, fieldErrors: { [field]: [message] } });
    expect(await roomsOf(s)).toBe(before);
  });

  it("renaming a room renames it on its sessions; renaming onto another room's name is a 409 naming name", async () => {
    actAs(s.as.chief);
    const made = await createRoomAction({ name: "Room nine", idempotencyKey: randomUUID() });
    const id = (made as { data: { id: string } }).data.id;
    const booked = await scheduleSessionAction(base({ roomId: id, date: "2026-11-20" }));
    expect(booked).toMatchObject({ ok: true });
    const sid = (booked as { data: { id: string } }).data.id;
    expect(await updateRoomAction({ roomId: id, name: "The  quiet room", capacity: "" })).toMatchObject({
      ok: true,
      data: { name: "The quiet room" },
    });
    const [row] = await sequelize.query<{ room: string; roomId: string }>(
      `SELECT room, room_id AS "roomId" FROM training_sessions WHERE id = :id`,
      { replacements: { id: sid }, type: QueryTypes.SELECT },
    );
    expect(row).toEqual({ room: "The quiet room", roomId: id });
    expect(await updateRoomAction({ roomId: id, name: "hangar classroom" })).toMatchObject({ ok: false, status: 409, field: "name" });
    expect(await updateRoomAction({ roomId: await roomId(other, "Hangar classroom"), name: "Taken over" })).toMatchObject({
      ok: false,
      status: 404,
      field: "roomId",
    });
  });

  it("a room out of use leaves the scheduling choices and refuses new bookings by id or name (400), but keeps its sessions", async () => {
    actAs(s.as.chief);
    const made = await createRoomAction({ name: "Old annex", idempotencyKey: randomUUID() });
    const id = (made as { data: { id: string } }).data.id;
    const booked = await scheduleSessionAction(base({ roomId: id, date: "2026-11-23" }));
    expect(booked).toMatchObject({ ok: true });
    expect(await setRoomActiveAction({ roomId: id, active: false })).toMatchObject({ ok: true, data: { active: false } });
    expect((await schedulingChoices(s.as.chief)).roomChoices.map((r) => r.id)).not.toContain(id);
    expect(await scheduleSessionAction(base({ roomId: id, date: "2026-11-24" }))).toMatchObject({
      ok: false,
      status: 400,
      field: "roomId",
    });
    expect(await scheduleSessionAction(base({ room: "old annex", date: "2026-11-24" }))).toMatchObject({
      ok: false,
      status: 400,
      field: "room",
    });
    // moving the booked session elsewhere still works
    const sid = (booked as { data: { id: string } }).data.id;
    const moved = await rescheduleSessionAction({
      sessionId: sid,
      date: "2026-11-25",
      time: "09:00",
      durationMinutes: 60,
      roomId: await roomId(s, "Briefing room 2"),
      instructorId: s.people.instructor.id,
      idempotencyKey: randomUUID(),
    });
    expect(moved).toMatchObject({ ok: true });
    expect(await setRoomActiveAction({ roomId: id, active: "no" })).toMatchObject({ ok: false, status: 400, field: "active" });
  });

  it("an instructor may not change the list (403), and nothing is written", async () => {
    const before = await roomsOf(s);
    actAs(s.as.instructor);
    expect(await createRoomAction({ name: "Instructors' den", idempotencyKey: randomUUID() })).toMatchObject({ ok: false, status: 403 });
    expect(await setRoomActiveAction({ roomId: await roomId(s, "Hangar classroom"), active: false })).toMatchObject({
      ok: false,
      status: 403,
    });
    expect(await roomsOf(s)).toBe(before);
  });
});
