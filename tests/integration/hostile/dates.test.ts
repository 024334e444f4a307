// Impossible and out-of-range dates (February 30, month 13, years 0000 and 9999) are refused with
// a 400 naming the field by the sessions API, scheduling, rescheduling (no mail goes out) and a
// cohort move (a membership date), instead of being shifted to another day or reaching PostgreSQL.
import { randomUUID } from "node:crypto";
import { NextRequest } from "next/server";
import { sequelize } from "@/db/index";
import { GET as listSessionsRoute } from "@/app/api/sessions/route";
import { scheduleSessionAction, rescheduleSessionAction } from "@/app/(app)/timetable/actions";
import { moveStudentAction } from "@/app/(app)/roster/actions";
import { actAs, closeDb, makeSchool } from "@/tests/helpers/factories";
import { makeBriefing, count, addRooms } from "../timetable/helpers";

jest.mock("next/cache", () => ({ revalidatePath: jest.fn() }));

type School = Awaited<ReturnType<typeof makeSchool>>;
let s: School;
let briefingId: string;

beforeAll(async () => {
  s = await makeSchool("hostile-dates");
  await addRooms(s, ["Hangar classroom", ...BAD_DATES.map(([v]) => `Room ${v}`)]);
  briefingId = (await makeBriefing(s, "Stalling and the polar", ["AER-01"])).id;
});
afterAll(async () => {
  actAs(null);
  await closeDb();
});

const BAD_DATES = [
  ["2026-02-30", "not a real calendar date"],
  ["2026-13-01", "not a real calendar date"],
  ["0000-01-01", "a year from 1950 to 2100"],
  ["9999-12-31", "a year from 1950 to 2100"],
] as const;

const sessionsOf = () => count(`SELECT count(*)::int AS n FROM training_sessions WHERE school_id = :s`, { s: s.school.id });
const mailOf = () => count(`SELECT count(*)::int AS n FROM outbox WHERE school_id = :s`, { s: s.school.id });

describe("GET /api/sessions", () => {
  test.each(BAD_DATES)("from=%s is a 400 naming from", async (value, message) => {
    actAs(s.as.chief);
    const res = await listSessionsRoute(new NextRequest(`http://localhost/api/sessions?from=${value}`), { params: Promise.resolve({}) });
    expect(res.status).toBe(400);
    expect(await res.json()).toEqual({ error: { status: 400, message: `from: ${message}`, field: "from" } });
  });
  test("to=2026-02-30 is a 400 naming to; a real date is a 200", async () => {
    actAs(s.as.chief);
    const bad = await listSessionsRoute(new NextRequest(`http://localhost/api/sessions?to=2026-02-30`), { params: Promise.resolve({}) });
    expect(bad.status).toBe(400);
    expect(((await bad.json()) as { error: { field: string } }).error.field).toBe("to");
    const ok = await listSessionsRoute(new NextRequest(`http://localhost/api/sessions?to=2026-02-28`), { params: Promise.resolve({}) });
    expect(ok.status).toBe(200);
  });
});

const scheduleInput = (over: Record<string, unknown>) => ({
  briefingId,
  date: "2026-11-02",
  time: "09:00",
  durationMinutes: 60,
  room: "Hangar classroom",
  instructorId: s.people.instructor.id,
  cohortId: "",
  studentIds: [s.people.students[0]!.id],
  idempotencyKey: randomUUID(),
  ...over,
});

describe("scheduling a session", () => {
  test.each(BAD_DATES)("date %s is refused naming date; no session, no mail", async (value, message) => {
    actAs(s.as.chief);
    const [sessions, mail] = [await sessionsOf(), await mailOf()];
    const res = await scheduleSessionAction(scheduleInput({ date: value }));
    expect(res).toMatchObject({ ok: false, status: 400, message: expect.stringContaining(message), fieldErrors: { date: [message] } });
    expect(await sessionsOf()).toBe(sessions);
    expect(await mailOf()).toBe(mail);
  });

  test.each(BAD_DATES)("with a cohort (membership dates are looked up), date %s is a 400, not a database error", async (value) => {
    actAs(s.as.chief);
    const res = await scheduleSessionAction(scheduleInput({ date: value, cohortId: s.cohorts.a.id, studentIds: [] }));
    expect(res).toMatchObject({ ok: false, status: 400, fieldErrors: { date: [expect.any(String)] } });
  });

  test("time 24:00 is refused naming time", async () => {
    actAs(s.as.chief);
    expect(await scheduleSessionAction(scheduleInput({ time: "24:00" }))).toMatchObject({
      ok: false,
      status: 400,
      fieldErrors: { time: [expect.any(String)] },
    });
  });
});

describe("rescheduling a session", () => {
  test.each(BAD_DATES)("to %s is refused naming date; the session keeps its time and nobody is mailed", async (value, message) => {
    actAs(s.as.chief);
    // a day of its own per case, so the cases do not double-book the instructor
    const day = `2026-11-1${BAD_DATES.findIndex(([v]) => v === value)}`;
    const made = await scheduleSessionAction(scheduleInput({ date: day, time: "14:00", room: `Room ${value}` }));
    expect(made.ok).toBe(true);
    const id = (made as { data: { id: string } }).data.id;
    const mail = await mailOf();
    const res = await rescheduleSessionAction({
      sessionId: id,
      date: value,
      time: "10:00",
      durationMinutes: 60,
      room: `Room ${value}`,
      instructorId: s.people.instructor.id,
      idempotencyKey: randomUUID(),
    });
    expect(res).toMatchObject({ ok: false, status: 400, message: expect.stringContaining(message), fieldErrors: { date: [message] } });
    expect(await mailOf()).toBe(mail);
    const [row] = await sequelize.query<{ starts: string }>(
      `SELECT to_char(starts_at AT TIME ZONE 'Europe/London', 'YYYY-MM-DD HH24:MI') AS starts FROM training_sessions WHERE id = :id`,
      {
        replacements: { id },
        type: "SELECT" as never,
      },
    );
    expect(row!.starts).toBe(`${day} 14:00`);
  });
});

describe("moving a student to another cohort (a membership date)", () => {
  test.each(BAD_DATES)("onDate %s is a 400 naming onDate and no membership changes", async (value, message) => {
    actAs(s.as.chief);
    const members = () =>
      count(`SELECT count(*)::int AS n FROM cohort_memberships WHERE student_id = :st`, { st: s.people.students[1]!.id });
    const before = await members();
    const res = await moveStudentAction({ studentId: s.people.students[1]!.id, toCohortId: s.cohorts.b.id, onDate: value });
    expect(res).toMatchObject({ ok: false, status: 400, message: expect.stringContaining(message), fieldErrors: { onDate: [message] } });
    expect(await members()).toBe(before);
  });
});
