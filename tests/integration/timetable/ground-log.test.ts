import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { makeSchool, closeDb, TEST_PASSWORD } from "@/tests/helpers/factories";
import { scheduleSession } from "@/db/access/timetable/schedule-session";
import { rescheduleSession } from "@/db/access/timetable/reschedule-session";
import { cancelSession } from "@/db/access/timetable/cancel-session";
import { recordAttendance } from "@/db/access/ground-log/record-attendance";
import { amendEntry } from "@/db/access/ground-log/amend-entry";
import { groundHoursFor } from "@/db/access/ground-log/ground-hours";
import { logbookFor } from "@/db/access/ground-log/logbook";
import { creditedMinutesFor } from "@/db/access/ground-log/ground-hours";
import { listMakeupFor } from "@/db/access/ground-log/list-makeup";
import { waiveMakeup, closeMakeup, scheduleMakeup } from "@/db/access/ground-log/change-makeup";
import { scheduleSessionSchema, recordAttendanceSchema, amendEntrySchema } from "@/lib/timetable/schema";
import { hoursLabel } from "@/lib/time";
import { setClock, resetClock } from "@/lib/clock";
import { makeBriefing, count, addRooms } from "./helpers";

afterAll(async () => {
  resetClock();
  await closeDb();
});

type School = Awaited<ReturnType<typeof makeSchool>>;
let s: School;
let aer: Awaited<ReturnType<typeof makeBriefing>>;
let atm: Awaited<ReturnType<typeof makeBriefing>>;

beforeAll(async () => {
  s = await makeSchool("gl");
  await addRooms(s, ["Hangar classroom", "Office"]);
  aer = await makeBriefing(s, "Drag curves", ["AER-01", "AER-02"]);
  atm = await makeBriefing(s, "The standard atmosphere", ["ATM-01"]);
  setClock(() => new Date("2026-11-30T12:00:00Z"));
});

async function session(briefingId: string, date: string, durationMinutes: number) {
  const input = scheduleSessionSchema.parse({
    briefingId,
    date,
    time: "09:00",
    durationMinutes,
    room: "Hangar classroom",
    instructorId: s.people.instructor.id,
    cohortId: s.cohorts.a.id,
  });
  return sequelize.transaction((t) => scheduleSession(s.as.instructor, input, t));
}
const record = (sessionId: string, lines: unknown[]) =>
  sequelize.transaction((t) => recordAttendance(s.as.instructor, recordAttendanceSchema.parse({ sessionId, lines }), t));

describe("credited minutes", () => {
  // the crediting rule itself (lib/timetable/crediting.ts) is unit-tested in tests/unit/timetable/crediting.test.ts
  it("totals per course and per stage from a mix of attended, late, left-early and absent entries", async () => {
    const [a, b] = s.people.students;
    const s1 = await session(aer.id, "2026-11-16", 90); // AER items
    const s2 = await session(atm.id, "2026-11-17", 60); // ATM item
    await record(s1.id, [
      { studentId: a!.id, status: "late", lateMinutes: 15 },
      { studentId: b!.id, status: "left_early", earlyMinutes: 30 },
      { studentId: s.people.students[2]!.id, status: "absent" },
    ]);
    await record(s2.id, [
      { studentId: a!.id, status: "attended" },
      { studentId: b!.id, status: "absent_excused" },
      { studentId: s.people.students[2]!.id, status: "attended" },
    ]);
    // a: 75 + 60 = 135 min; b: 60 + 0 = 60 min; c: 0 + 60 = 60 min
    expect(await creditedMinutesFor(a!.id, s.course.id)).toBe(135);
    expect(await creditedMinutesFor(b!.id, s.course.id)).toBe(60);
    expect(await creditedMinutesFor(s.people.students[2]!.id, s.course.id)).toBe(60);
    const hours = await groundHoursFor(a!.id, s.course.id);
    expect(hours!.byStage).toEqual([
      { stageCode: "AER", stageTitle: "Principles of flight: drag and speed", minutes: 75 },
      { stageCode: "ATM", stageTitle: expect.any(String), minutes: 60 },
    ]);
    expect(hoursLabel(hours!.creditedMinutes, hours!.minimumMinutes)).toBe("2.3 of 35 h"); // 135 min = 2.25 h, one decimal
    // recording the same student twice is refused: corrections are amendments
    await expect(record(s1.id, [{ studentId: a!.id, status: "attended" }])).rejects.toMatchObject({ status: 409 });
    // a session with attendance can no longer be moved or cancelled
    await expect(
      sequelize.transaction((t) =>
        rescheduleSession(
          s.as.instructor,
          {
            sessionId: s1.id,
            date: "2026-11-16",
            time: "10:00",
            durationMinutes: 90,
            room: "Hangar classroom",
            instructorId: s.people.instructor.id,
          },
          t,
        ),
      ),
    ).rejects.toMatchObject({ status: 409 });
    await expect(
      sequelize.transaction((t) => cancelSession(s.as.instructor, { sessionId: s1.id, reason: "too late" }, t)),
    ).rejects.toMatchObject({ status: 409 });
  });

  it("an amendment changes the total while the original entry stays", async () => {
    const a = s.people.students[0]!;
    const before = await creditedMinutesFor(a.id, s.course.id);
    const [orig] = await sequelize.query<{ id: string; credited_minutes: number }>(
      `SELECT e.id, e.credited_minutes FROM ground_log_entries e JOIN training_sessions t ON t.id = e.session_id
        WHERE e.student_id = :st AND t.briefing_id = :b AND e.amends_entry_id IS NULL`,
      { replacements: { st: a.id, b: aer.id }, type: QueryTypes.SELECT },
    );
    expect(orig!.credited_minutes).toBe(75);
    const amended = await sequelize.transaction((t) =>
      amendEntry(
        s.as.instructor,
        amendEntrySchema.parse({
          entryId: orig!.id,
          status: "late",
          lateMinutes: 5,
          reason: "Arrived at 09:05, not 09:15",
          password: TEST_PASSWORD,
        }),
        t,
      ),
    );
    expect(amended.credited).toBe(85);
    expect(await creditedMinutesFor(a.id, s.course.id)).toBe(before + 10);
    const chain = await sequelize.query<{ id: string; credited_minutes: number; amends_entry_id: string | null; reason: string | null }>(
      `SELECT id, credited_minutes, amends_entry_id, reason FROM ground_log_entries WHERE student_id = :st AND session_id = (SELECT session_id FROM ground_log_entries WHERE id = :id) ORDER BY entry_no`,
      { replacements: { st: a.id, id: orig!.id }, type: QueryTypes.SELECT },
    );
    expect(chain).toEqual([
      { id: orig!.id, credited_minutes: 75, amends_entry_id: null, reason: null },
      { id: amended.entryId, credited_minutes: 85, amends_entry_id: orig!.id, reason: "Arrived at 09:05, not 09:15" },
    ]);
    // the original cannot be amended a second time: only the latest entry can
    await expect(
      sequelize.transaction((t) =>
        amendEntry(
          s.as.instructor,
          amendEntrySchema.parse({ entryId: orig!.id, status: "attended", reason: "second try", password: TEST_PASSWORD }),
          t,
        ),
      ),
    ).rejects.toMatchObject({ status: 409 });
    const log = await logbookFor(s.school.id, a.id);
    expect(log.map((l) => [l.date, l.durationMinutes, l.amended])).toEqual([
      ["2026-11-16", 85, true],
      ["2026-11-17", 60, false],
    ]);
    expect(log[0]!.subjects).toBe("Drag curves (AER-01, AER-02)");
    expect(log[0]!.certificateNumber).toMatch(/^GI-/);
  });

  it("the app's database role cannot UPDATE, DELETE or TRUNCATE ground log entries", async () => {
    const [e] = await sequelize.query<{ id: string }>(`SELECT id FROM ground_log_entries WHERE school_id = :s LIMIT 1`, {
      replacements: { s: s.school.id },
      type: QueryTypes.SELECT,
    });
    await expect(
      sequelize.query(`UPDATE ground_log_entries SET credited_minutes = 999 WHERE id = :id`, { replacements: { id: e!.id } }),
    ).rejects.toThrow(/permission denied/);
    await expect(sequelize.query(`DELETE FROM ground_log_entries WHERE id = :id`, { replacements: { id: e!.id } })).rejects.toThrow(
      /permission denied/,
    );
    await expect(sequelize.query(`TRUNCATE ground_log_entries`)).rejects.toThrow(/permission denied/);
    expect(await count(`SELECT count(*)::int AS n FROM ground_log_entries WHERE id = :id AND credited_minutes <> 999`, { id: e!.id })).toBe(
      1,
    );
  });
});

describe("make-up items", () => {
  it("an absence opens one make-up item per syllabus item the session covered; attending a later session on them closes them", async () => {
    const c = s.people.students[2]!; // absent from the AER session above
    const open = (await listMakeupFor([c.id])).filter((m) => m.state === "open");
    expect(open.map((m) => m.itemCode).sort()).toEqual(["AER-01", "AER-02"]);
    const b = s.people.students[1]!; // absent (excused) from the ATM session
    expect((await listMakeupFor([b.id])).map((m) => [m.itemCode, m.state])).toEqual([["ATM-01", "open"]]);
    // a second absence on the same items adds nothing new to make up
    const missedAgain = await session(aer.id, "2026-11-20", 60);
    await record(missedAgain.id, [{ studentId: c.id, status: "absent" }]);
    expect((await listMakeupFor([c.id])).map((m) => m.itemCode).sort()).toEqual(["AER-01", "AER-02"]);
    // a later AER session that c attends closes both as done by that session
    const again = await session(aer.id, "2026-11-23", 60);
    await record(again.id, [{ studentId: c.id, status: "attended" }]);
    const after = await listMakeupFor([c.id]);
    expect(after.map((m) => [m.itemCode, m.state, m.closedByKind]).sort()).toEqual([
      ["AER-01", "done", "session"],
      ["AER-02", "done", "session"],
    ]);
  });

  it("an item planned into a later session is scheduled, and done once the student attends that session", async () => {
    setClock(() => new Date("2026-11-25T12:00:00Z"));
    const st = s.people.students[2]!;
    const missed = await session(atm.id, "2026-11-18", 60);
    await record(missed.id, [{ studentId: st.id, status: "absent" }]);
    const [item] = (await listMakeupFor([st.id])).filter((m) => m.itemCode === "ATM-01" && m.state === "open");
    // an instructor may not waive it: that is the chief's
    await expect(
      sequelize.transaction((t) =>
        waiveMakeup(s.as.instructor, { itemId: item!.id, reason: "Not mine to waive", password: TEST_PASSWORD }, t),
      ),
    ).rejects.toMatchObject({ status: 403 });
    // it cannot be planned into a session the student does not attend
    const notTheirs = await sequelize.transaction((t) =>
      scheduleSession(
        s.as.instructor,
        scheduleSessionSchema.parse({
          briefingId: aer.id,
          date: "2026-11-28",
          time: "15:00",
          durationMinutes: 30,
          room: "Office",
          instructorId: s.people.instructor.id,
          studentIds: [s.people.students[0]!.id],
        }),
        t,
      ),
    );
    await expect(
      sequelize.transaction((t) => scheduleMakeup(s.as.instructor, { itemId: item!.id, sessionId: notTheirs.id }, t)),
    ).rejects.toMatchObject({ status: 400, field: "sessionId" });
    // a one-to-one catch-up session for that student only, on another briefing
    const catchUp = await sequelize.transaction((t) =>
      scheduleSession(
        s.as.instructor,
        scheduleSessionSchema.parse({
          briefingId: aer.id,
          date: "2026-11-27",
          time: "15:00",
          durationMinutes: 30,
          room: "Office",
          instructorId: s.people.instructor.id,
          studentIds: [st.id],
        }),
        t,
      ),
    );
    await sequelize.transaction((t) => scheduleMakeup(s.as.instructor, { itemId: item!.id, sessionId: catchUp.id }, t));
    expect((await listMakeupFor([st.id])).find((m) => m.id === item!.id)).toMatchObject({
      state: "scheduled",
      scheduledSessionId: catchUp.id,
    });
    setClock(() => new Date("2026-11-30T12:00:00Z"));
    await record(catchUp.id, [{ studentId: st.id, status: "attended" }]);
    expect((await listMakeupFor([st.id])).find((m) => m.id === item!.id)).toMatchObject({ state: "done", closedByKind: "session" });
  });

  it("self-study closed by an oral check, and a waiver needs the chief's reason", async () => {
    const b = s.people.students[1]!;
    const [item] = await listMakeupFor([b.id]);
    await sequelize.transaction((t) =>
      closeMakeup(s.as.instructor, { itemId: item!.id, how: "oral_check", note: "Self-study; oral check on 2026-11-25" }, t),
    );
    expect((await listMakeupFor([b.id]))[0]).toMatchObject({ state: "done", closedByKind: "oral_check" });
    await expect(
      sequelize.transaction((t) => waiveMakeup(s.as.chief, { itemId: item!.id, reason: "Already done", password: TEST_PASSWORD }, t)),
    ).rejects.toMatchObject({ status: 409 });
  });

  it("amending an absence to attended closes its make-up items; the chief can waive with a reason", async () => {
    const d = s.people.students[0]!;
    const sx = await session(atm.id, "2026-11-24", 60);
    await record(sx.id, [{ studentId: d.id, status: "absent" }]);
    const [entry] = await sequelize.query<{ id: string }>(`SELECT id FROM ground_log_entries WHERE session_id = :s AND student_id = :st`, {
      replacements: { s: sx.id, st: d.id },
      type: QueryTypes.SELECT,
    });
    let items = (await listMakeupFor([d.id])).filter((m) => m.state === "open");
    expect(items.map((m) => m.itemCode)).toEqual(["ATM-01"]);
    await sequelize.transaction((t) =>
      waiveMakeup(s.as.chief, { itemId: items[0]!.id, reason: "Covered in the ATM workshop", password: TEST_PASSWORD }, t),
    );
    items = await listMakeupFor([d.id]);
    expect(items.find((m) => m.id === items[0]!.id)).toMatchObject({ state: "waived", waivedReason: "Covered in the ATM workshop" });
    const before = await creditedMinutesFor(d.id, s.course.id);
    await sequelize.transaction((t) =>
      amendEntry(
        s.as.instructor,
        amendEntrySchema.parse({
          entryId: entry!.id,
          status: "attended",
          reason: "Was in the room; register misread",
          password: TEST_PASSWORD,
        }),
        t,
      ),
    );
    expect(await creditedMinutesFor(d.id, s.course.id)).toBe(before + 60);
  });
});
