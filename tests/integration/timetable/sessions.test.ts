import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { makeSchool, closeDb } from "@/tests/helpers/factories";
import { scheduleSession } from "@/db/access/timetable/schedule-session";
import { rescheduleSession } from "@/db/access/timetable/reschedule-session";
import { cancelSession } from "@/db/access/timetable/cancel-session";
import { listSessions } from "@/db/access/timetable/list-sessions";
import { schedulingChoices } from "@/db/access/timetable/scheduling-choices";
import { scheduleSessionSchema } from "@/lib/timetable/schema";
import { HttpError } from "@/lib/http/errors";
import { formatInZone } from "@/lib/time";
import { makeBriefing, count, addRooms } from "./helpers";

afterAll(closeDb);

type School = Awaited<ReturnType<typeof makeSchool>>;
let s: School;
let briefing: { id: string };

beforeAll(async () => {
  s = await makeSchool("tt");
  await addRooms(s, [
    "Hangar classroom",
    "Briefing room 2",
    "Room A",
    "Room B",
    "Room C",
    "Room D",
    "Room E",
    "Room F",
    "Elsewhere",
    "DST room",
    "Night room",
  ]);
  briefing = await makeBriefing(s, "Drag and the minimum-drag speed", ["AER-01", "AER-02"]);
});

function input(over: Partial<Record<string, unknown>>) {
  return scheduleSessionSchema.parse({
    briefingId: briefing.id,
    date: "2026-11-02",
    time: "09:00",
    durationMinutes: 60,
    room: "Hangar classroom",
    instructorId: s.people.instructor.id,
    cohortId: "",
    studentIds: [],
    ...over,
  });
}

const schedule = (over: Partial<Record<string, unknown>>) => sequelize.transaction((t) => scheduleSession(s.as.chief, input(over), t));

async function settleBoth<T>(a: Promise<T>, b: Promise<T>) {
  const results = await Promise.allSettled([a, b]);
  const ok = results.filter((r) => r.status === "fulfilled");
  const refused = results.filter((r): r is PromiseRejectedResult => r.status === "rejected");
  return { ok, refused };
}

describe("the database refuses double-booking", () => {
  it("two concurrent sessions for one instructor: exactly one is created, the other is a 409 naming the instructor and the time", async () => {
    const { ok, refused } = await settleBoth(
      schedule({ date: "2026-11-03", time: "10:00", room: "Room A", studentIds: [s.people.students[0]!.id] }),
      schedule({ date: "2026-11-03", time: "10:30", room: "Room B", studentIds: [s.people.students[1]!.id] }),
    );
    expect(ok).toHaveLength(1);
    expect(refused).toHaveLength(1);
    const err = refused[0]!.reason as HttpError;
    expect(err).toBeInstanceOf(HttpError);
    expect(err.status).toBe(409);
    expect(err.field).toBe("instructorId");
    expect(err.message).toMatch(/Instructor One already teaches "Drag and the minimum-drag speed" Tue 3 Nov 2026, 1[01]:[03]0–1[01]:[03]0/);
    expect(
      await count(`SELECT count(*)::int AS n FROM training_sessions WHERE school_id = :s AND starts_at::date = '2026-11-03'`, {
        s: s.school.id,
      }),
    ).toBe(1);
  });

  it("two concurrent sessions in one room (different instructors): exactly one is created", async () => {
    const { ok, refused } = await settleBoth(
      schedule({ date: "2026-11-04", time: "10:00", room: "Briefing room 2", studentIds: [s.people.students[0]!.id] }),
      schedule({
        date: "2026-11-04",
        time: "10:15",
        room: "  briefing ROOM 2 ",
        instructorId: s.people.instructor2.id,
        studentIds: [s.people.students[1]!.id],
      }),
    );
    expect(ok).toHaveLength(1);
    const err = refused[0]!.reason as HttpError;
    expect(err.status).toBe(409);
    expect(err.field).toBe("room");
    expect(err.message).toMatch(/is already booked for "Drag and the minimum-drag speed" Wed 4 Nov 2026, 10:(00|15)/);
  });

  it("two concurrent sessions for one student (different instructor and room): exactly one is created, the 409 names the student", async () => {
    const student = s.people.students[2]!;
    const { ok, refused } = await settleBoth(
      schedule({ date: "2026-11-05", time: "14:00", room: "Room C", studentIds: [student.id] }),
      schedule({
        date: "2026-11-05",
        time: "14:45",
        room: "Room D",
        instructorId: s.people.instructor2.id,
        studentIds: [student.id, s.people.students[3]!.id],
      }),
    );
    expect(ok).toHaveLength(1);
    const err = refused[0]!.reason as HttpError;
    expect(err.status).toBe(409);
    expect(err.field).toBe("studentIds");
    expect(err.message).toContain(`${student.name} is already in "Drag and the minimum-drag speed" Thu 5 Nov 2026, 14:`);
    expect(
      await count(`SELECT count(*)::int AS n FROM session_attendees WHERE student_id = :st AND starts_at::date = '2026-11-05'`, {
        st: student.id,
      }),
    ).toBe(1);
  });

  it("back-to-back sessions of one instructor, room and cohort are allowed", async () => {
    const a = await schedule({ date: "2026-11-06", time: "09:00", durationMinutes: 60, cohortId: s.cohorts.a.id });
    const b = await schedule({ date: "2026-11-06", time: "10:00", durationMinutes: 45, cohortId: s.cohorts.a.id });
    expect(b.startsAt.getTime()).toBe(a.endsAt.getTime());
    expect(a.attendeeCount).toBe(3);
    expect(b.attendeeCount).toBe(3);
  });

  it("a cancelled session blocks nothing, and cancelling tells each attendee once through the outbox", async () => {
    const first = await schedule({ date: "2026-11-09", time: "09:00", cohortId: s.cohorts.a.id });
    await expect(schedule({ date: "2026-11-09", time: "09:30", cohortId: s.cohorts.a.id, room: "Elsewhere" })).rejects.toMatchObject({
      status: 409,
    });
    const c = await sequelize.transaction((t) => cancelSession(s.as.chief, { sessionId: first.id, reason: "Instructor unwell" }, t));
    expect(c.sequence).toBe(1);
    const again = await schedule({ date: "2026-11-09", time: "09:30", cohortId: s.cohorts.a.id });
    expect(again.attendeeCount).toBe(3);
    const mails = await sequelize.query<{ kind: string; idempotency_key: string; subject: string }>(
      `SELECT kind, idempotency_key, subject FROM outbox WHERE idempotency_key LIKE :k ORDER BY to_address`,
      { replacements: { k: `session.cancelled:${first.id}:%` }, type: QueryTypes.SELECT },
    );
    expect(mails).toHaveLength(3);
    expect(mails.every((m) => m.idempotency_key.startsWith(`session.cancelled:${first.id}:1:`))).toBe(true);
    await expect(
      sequelize.transaction((t) => cancelSession(s.as.chief, { sessionId: first.id, reason: "again" }, t)),
    ).rejects.toMatchObject({ status: 409 });
  });
});

describe("rescheduling", () => {
  it("moves the session, grows its sequence, keeps attendees' ranges in sync and mails each attendee with the new sequence", async () => {
    const a = await schedule({ date: "2026-11-10", time: "09:00", cohortId: s.cohorts.b.id, instructorId: s.people.instructor2.id });
    const r1 = await sequelize.transaction((t) =>
      rescheduleSession(
        s.as.chief,
        {
          sessionId: a.id,
          date: "2026-11-10",
          time: "13:00",
          durationMinutes: 90,
          room: "Hangar classroom",
          instructorId: s.people.instructor2.id,
        },
        t,
      ),
    );
    const r2 = await sequelize.transaction((t) =>
      rescheduleSession(
        s.as.chief,
        {
          sessionId: a.id,
          date: "2026-11-11",
          time: "13:00",
          durationMinutes: 90,
          room: "Hangar classroom",
          instructorId: s.people.instructor2.id,
        },
        t,
      ),
    );
    expect([r1.sequence, r2.sequence]).toEqual([1, 2]);
    const att = await sequelize.query<{ starts_at: Date; ends_at: Date }>(
      `SELECT starts_at, ends_at FROM session_attendees WHERE session_id = :id`,
      {
        replacements: { id: a.id },
        type: QueryTypes.SELECT,
      },
    );
    expect(att).toHaveLength(3);
    for (const x of att) {
      expect(new Date(x.starts_at).toISOString()).toBe("2026-11-11T13:00:00.000Z"); // London is on GMT in November
      expect(new Date(x.ends_at).toISOString()).toBe("2026-11-11T14:30:00.000Z");
    }
    expect(
      await count(`SELECT count(*)::int AS n FROM outbox WHERE idempotency_key LIKE :k`, { k: `session.rescheduled:${a.id}:1:%` }),
    ).toBe(3);
    expect(
      await count(`SELECT count(*)::int AS n FROM outbox WHERE idempotency_key LIKE :k`, { k: `session.rescheduled:${a.id}:2:%` }),
    ).toBe(3);
  });

  it("a reschedule onto a busy instructor is refused with a 409 and changes nothing", async () => {
    const busy = await schedule({ date: "2026-11-12", time: "09:00", room: "Room E", studentIds: [s.people.students[0]!.id] });
    const other = await schedule({ date: "2026-11-12", time: "11:00", room: "Room F", studentIds: [s.people.students[1]!.id] });
    await expect(
      sequelize.transaction((t) =>
        rescheduleSession(
          s.as.chief,
          {
            sessionId: other.id,
            date: "2026-11-12",
            time: "09:30",
            durationMinutes: 60,
            room: "Room F",
            instructorId: s.people.instructor.id,
          },
          t,
        ),
      ),
    ).rejects.toMatchObject({ status: 409, field: "instructorId" });
    const [row] = await sequelize.query<{ sequence: number; starts_at: Date }>(
      `SELECT sequence, starts_at FROM training_sessions WHERE id = :id`,
      {
        replacements: { id: other.id },
        type: QueryTypes.SELECT,
      },
    );
    expect(row!.sequence).toBe(0);
    expect(new Date(row!.starts_at).toISOString()).toBe(other.startsAt.toISOString());
    expect(busy.id).not.toBe(other.id);
  });
});

describe("daylight-saving changes in Europe/London", () => {
  // Source: UK summer time rules (BST begins 01:00 GMT on the last Sunday of March, ends 01:00 GMT on the
  // last Sunday of October); for 2027 that is 28 March, for 2026 it is 25 October. Common practice.
  it("a weekly slot keeps its 10:00 wall-clock time on both sides of the spring change, with the same length", async () => {
    const before = await schedule({
      date: "2027-03-27",
      time: "10:00",
      durationMinutes: 90,
      room: "DST room",
      studentIds: [s.people.students[4]!.id],
    });
    const after = await schedule({
      date: "2027-03-29",
      time: "10:00",
      durationMinutes: 90,
      room: "DST room",
      studentIds: [s.people.students[4]!.id],
    });
    expect(before.startsAt.toISOString()).toBe("2027-03-27T10:00:00.000Z"); // GMT
    expect(after.startsAt.toISOString()).toBe("2027-03-29T09:00:00.000Z"); // BST = UTC+1
    for (const x of [before, after]) {
      expect(formatInZone(x.startsAt, "Europe/London", "HH:mm")).toBe("10:00");
      expect(formatInZone(x.endsAt, "Europe/London", "HH:mm")).toBe("11:30");
      expect(x.endsAt.getTime() - x.startsAt.getTime()).toBe(90 * 60_000);
    }
  });

  it("a session running through the autumn change keeps its real length: 00:30 for 120 min ends at 01:30 wall-clock", async () => {
    const x = await schedule({
      date: "2026-10-25",
      time: "00:30",
      durationMinutes: 120,
      room: "Night room",
      studentIds: [s.people.students[5]!.id],
    });
    expect(x.startsAt.toISOString()).toBe("2026-10-24T23:30:00.000Z"); // 00:30 BST
    expect(x.endsAt.toISOString()).toBe("2026-10-25T01:30:00.000Z");
    expect(formatInZone(x.endsAt, "Europe/London", "HH:mm")).toBe("01:30"); // 01:30 GMT, after the clocks went back
    const listed = await listSessions(s.as.chief, { room: "Night room" });
    expect(listed.rows[0]).toMatchObject({ date: "2026-10-25", startLocal: "00:30", endLocal: "01:30", durationMinutes: 120 });
  });
});

describe("who sees which sessions", () => {
  it("a student sees only the sessions they attend; a sponsor sees none; the chief sees the school's", async () => {
    const mine = await listSessions(s.as.student, {});
    const theirs = await listSessions(s.as.otherStudent, {});
    const all = await listSessions(s.as.chief, {});
    const sponsor = await listSessions(s.as.sponsor, {});
    expect(sponsor.total).toBe(0);
    expect(mine.total).toBeGreaterThan(0);
    expect(all.total).toBeGreaterThan(mine.total);
    const attendeeOf = async (studentId: string) =>
      (
        await sequelize.query<{ id: string }>(`SELECT session_id AS id FROM session_attendees WHERE student_id = :st`, {
          replacements: { st: studentId },
          type: QueryTypes.SELECT,
        })
      )
        .map((r) => r.id)
        .sort();
    expect(mine.rows.map((r) => r.id).sort()).toEqual(await attendeeOf(s.people.students[0]!.id));
    expect(theirs.rows.map((r) => r.id).sort()).toEqual(await attendeeOf(s.people.students[3]!.id));
  });

  it("a staff caller may narrow the school's sessions to those one student attends", async () => {
    const st = s.people.students[3]!;
    const narrowed = await listSessions(s.as.instructor, { attendee: st.id });
    const attended = await sequelize.query<{ id: string }>(`SELECT session_id AS id FROM session_attendees WHERE student_id = :st`, {
      replacements: { st: st.id },
      type: QueryTypes.SELECT,
    });
    expect(attended.length).toBeGreaterThan(0);
    expect(narrowed.rows.map((r) => r.id).sort()).toEqual(attended.map((r) => r.id).sort());
  });
});

describe("who may teach", () => {
  it("the scheduling form offers the school's active instructors and chief, and a student cannot be the instructor", async () => {
    const choices = await schedulingChoices(s.as.chief);
    expect(choices.instructors.kind === "list" && choices.instructors.rows.map((i) => i.id).sort()).toEqual(
      [s.people.chief.id, s.people.instructor.id, s.people.instructor2.id].sort(),
    );
    await expect(schedule({ instructorId: s.people.students[0]!.id, cohortId: s.cohorts.a.id, date: "2026-12-07" })).rejects.toMatchObject({
      status: 404,
      field: "instructorId",
    });
  });
});
