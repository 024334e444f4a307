import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { makeSchool, closeDb } from "@/tests/helpers/factories";
import { makeBriefing } from "@/tests/integration/timetable/helpers";
import { sessionsAwaitingAttendance, teachingWeek } from "@/db/access/today/teaching-week";
import { fixedClock, resetClock } from "@/lib/clock";

afterAll(closeDb);
afterEach(resetClock);

type School = Awaited<ReturnType<typeof makeSchool>>;

/** A scheduled session written straight to the table, attended by the given students. */
async function session(
  s: School,
  briefing: { id: string; revisionId: string },
  o: { start: string; end: string; instructorId: string; room: string; students: string[] },
) {
  const [row] = await sequelize.query<{ id: string }>(
    `INSERT INTO training_sessions (school_id, briefing_id, briefing_revision_id, starts_at, ends_at, room, instructor_id, created_by)
     VALUES (:school, :b, :r, :start, :end, :room, :i, :i) RETURNING id`,
    {
      replacements: {
        school: s.school.id,
        b: briefing.id,
        r: briefing.revisionId,
        start: o.start,
        end: o.end,
        room: o.room,
        i: o.instructorId,
      },
      type: QueryTypes.SELECT,
    },
  );
  for (const st of o.students)
    await sequelize.query(`INSERT INTO session_attendees (session_id, student_id) VALUES (:s, :st)`, { replacements: { s: row!.id, st } });
  return row!.id;
}

describe("the instructor's Today (clock fixed at Wednesday 2 December 2026, 15:00 in London)", () => {
  it("asks for attendance as soon as a session ends: one that ended 10 minutes ago is listed, one still running is not", async () => {
    const s = await makeSchool("teachwk1");
    const b = await makeBriefing(s, "Drag and the bucket", []);
    const students = s.people.students.slice(0, 2).map((p) => p.id);
    const me = s.people.instructor.id;
    const ended = await session(s, b, {
      start: "2026-12-02T13:50:00Z",
      end: "2026-12-02T14:50:00Z",
      instructorId: me,
      room: "Room 1",
      students,
    });
    const running = await session(s, b, {
      start: "2026-12-02T14:55:00Z",
      end: "2026-12-02T15:30:00Z",
      instructorId: me,
      room: "Room 2",
      students: [s.people.students[2]!.id],
    });
    const others = await session(s, b, {
      start: "2026-12-02T13:00:00Z",
      end: "2026-12-02T14:00:00Z",
      instructorId: s.people.instructor2.id,
      room: "Room 3",
      students: [s.people.students[3]!.id],
    });
    fixedClock(new Date("2026-12-02T15:00:00Z"));
    const due = (await sessionsAwaitingAttendance(s.as.instructor)).map((r) => r.id);
    expect(due).toContain(ended);
    expect(due).not.toContain(running);
    expect(due).not.toContain(others);
    // once the running one ends it is asked for too
    fixedClock(new Date("2026-12-02T15:31:00Z"));
    expect((await sessionsAwaitingAttendance(s.as.instructor)).map((r) => r.id)).toEqual(expect.arrayContaining([ended, running]));
  });

  it("shows the instructor's own sessions today and on the week's other days, Monday to Sunday, not another instructor's or next week's", async () => {
    const s = await makeSchool("teachwk2");
    const b = await makeBriefing(s, "Power required", []);
    const me = s.people.instructor.id;
    const st = (i: number) => [s.people.students[i]!.id];
    const today = await session(s, b, {
      start: "2026-12-02T09:00:00Z",
      end: "2026-12-02T10:00:00Z",
      instructorId: me,
      room: "Room 1",
      students: st(0),
    });
    const monday = await session(s, b, {
      start: "2026-11-30T09:00:00Z",
      end: "2026-11-30T10:00:00Z",
      instructorId: me,
      room: "Room 1",
      students: st(1),
    });
    const friday = await session(s, b, {
      start: "2026-12-04T09:00:00Z",
      end: "2026-12-04T10:00:00Z",
      instructorId: me,
      room: "Room 1",
      students: st(2),
    });
    const nextMonday = await session(s, b, {
      start: "2026-12-07T09:00:00Z",
      end: "2026-12-07T10:00:00Z",
      instructorId: me,
      room: "Room 1",
      students: st(0),
    });
    const notMine = await session(s, b, {
      start: "2026-12-02T11:00:00Z",
      end: "2026-12-02T12:00:00Z",
      instructorId: s.people.instructor2.id,
      room: "Room 2",
      students: st(3),
    });
    fixedClock(new Date("2026-12-02T15:00:00Z"));
    const week = await teachingWeek(s.as.instructor);
    expect(week.today).toBe("2026-12-02");
    expect([week.weekFrom, week.weekTo]).toEqual(["2026-11-30", "2026-12-06"]);
    expect(week.todaySessions.map((r) => r.id)).toEqual([today]);
    expect(week.weekSessions.map((r) => r.id)).toEqual([monday, friday]);
    for (const id of [nextMonday, notMine]) {
      expect(week.todaySessions.map((r) => r.id)).not.toContain(id);
      expect(week.weekSessions.map((r) => r.id)).not.toContain(id);
    }
  });
});
