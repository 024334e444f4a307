import { QueryTypes } from "sequelize";
import { sequelize } from "../index";
import { scheduleSession } from "../access/timetable/schedule-session";
import { createRoom } from "../access/rooms/save-room";
import { cancelSession } from "../access/timetable/cancel-session";
import { recordAttendance } from "../access/ground-log/record-attendance";
import { scheduleSessionSchema, recordAttendanceSchema, type AttendanceStatusName } from "@/lib/timetable/schema";
import type { CurrentUser } from "@/lib/auth/session";
import type { SeedContext } from "./extensions";

// Demo Timetable for the Larkhollow scenario: past sessions with attendance (a mix of attended,
// late, left early and absent, so Ground hours and make-up items show), one past session still
// waiting for its attendance, and upcoming sessions this week and next for both cohorts.
// Rooms are the school's own: "Hangar classroom" and "Briefing room 2".

interface SeedBriefing {
  id: string;
  title: string;
}

/** The briefings seeded by the briefings area; if there are none, two plain ones of our own. */
async function briefingsFor(ctx: SeedContext): Promise<SeedBriefing[]> {
  const found = await sequelize.query<SeedBriefing>(
    `SELECT b.id, br.title FROM briefings b JOIN briefing_revisions br ON br.id = b.current_revision_id WHERE b.school_id = :s ORDER BY b.created_at, br.title`,
    { replacements: { s: ctx.schoolId }, type: QueryTypes.SELECT, transaction: ctx.t },
  );
  if (found.length >= 2) return found;
  const own: [string, string[]][] = [
    ["Why drag has a minimum", ["AER-01", "AER-02", "AER-03"]],
    ["The standard atmosphere at work", ["ATM-01", "ATM-02"]],
  ];
  const out: SeedBriefing[] = [...found];
  for (const [title, codes] of own) {
    const [b] = await sequelize.query<{ id: string }>(
      `INSERT INTO briefings (school_id, course_id, owner_id) VALUES (:s, :c, :o) RETURNING id`,
      { replacements: { s: ctx.schoolId, c: ctx.courseId, o: ctx.people.instructor }, type: QueryTypes.SELECT, transaction: ctx.t },
    );
    const [r] = await sequelize.query<{ id: string }>(
      `INSERT INTO briefing_revisions (briefing_id, number, title, objective, elements, completion_standard, syllabus_revision_id, created_by)
       VALUES (:b, 1, :title, :obj, :el::jsonb, :std, :rev, :o) RETURNING id`,
      {
        replacements: {
          b: b!.id,
          title,
          obj: `Students can explain ${title.toLowerCase()} in their own words.`,
          el: JSON.stringify([
            { title: "Set the scene", instructorActions: "Board sketch", studentActions: "Predict", minutes: 20 },
            { title: "Work it through", instructorActions: "Guide", studentActions: "Calculate", minutes: 55 },
            { title: "Check", instructorActions: "Question", studentActions: "Answer", minutes: 15 },
          ]),
          std: "Answers the check questions without prompting.",
          rev: ctx.revisionId,
          o: ctx.people.instructor,
        },
        type: QueryTypes.SELECT,
        transaction: ctx.t,
      },
    );
    await sequelize.query(
      `INSERT INTO briefing_revision_items (briefing_revision_id, syllabus_item_id) SELECT :r, id FROM syllabus_items WHERE revision_id = :rev AND code = ANY(ARRAY[:codes]::text[])`,
      { replacements: { r: r!.id, rev: ctx.revisionId, codes }, transaction: ctx.t },
    );
    await sequelize.query(`UPDATE briefings SET current_revision_id = :r WHERE id = :b`, {
      replacements: { r: r!.id, b: b!.id },
      transaction: ctx.t,
    });
    out.push({ id: b!.id, title });
  }
  return out;
}

/** A varied but repeatable attendance line for the i-th student of session n. */
function lineFor(n: number, i: number, studentId: string) {
  const k = (n * 5 + i * 3) % 11;
  const status: AttendanceStatusName =
    k === 0 ? "absent" : k === 4 ? "absent_excused" : k === 7 ? "late" : k === 9 ? "left_early" : "attended";
  return { studentId, status, lateMinutes: status === "late" ? 15 : 0, earlyMinutes: status === "left_early" ? 20 : 0 };
}

export async function seedTimetable(ctx: SeedContext): Promise<void> {
  const briefings = await briefingsFor(ctx);
  const chief: CurrentUser = { id: ctx.people.chief, name: "Imogen Farrant", roles: ["chief", "instructor"], schoolId: ctx.schoolId };
  const HANGAR = "Hangar classroom";
  const ROOM2 = "Briefing room 2";
  // the school's list of rooms (the Timetable books only listed rooms)
  await createRoom(chief, { name: HANGAR, capacity: 24 }, ctx.t);
  await createRoom(chief, { name: ROOM2, capacity: 10 }, ctx.t);
  const plan = (i: number) => briefings[i % briefings.length]!.id;
  const schedule = async (
    briefingId: string,
    date: string,
    time: string,
    minutes: number,
    room: string,
    instructorId: string,
    cohortId: string,
  ) =>
    scheduleSession(
      chief,
      scheduleSessionSchema.parse({ briefingId, date, time, durationMinutes: minutes, room, instructorId, cohortId }),
      ctx.t,
    );

  // Past sessions with attendance: Kestrel (lead Tomasz) in the hangar, Merlin (lead Priya) in room 2.
  const past: { offset: number; cohort: string; instructor: string; room: string; time: string; minutes: number }[] = [
    { offset: -27, cohort: ctx.cohorts.a, instructor: ctx.people.instructor, room: HANGAR, time: "09:00", minutes: 120 },
    { offset: -20, cohort: ctx.cohorts.a, instructor: ctx.people.instructor, room: HANGAR, time: "09:00", minutes: 90 },
    { offset: -13, cohort: ctx.cohorts.a, instructor: ctx.people.instructor, room: HANGAR, time: "09:00", minutes: 120 },
    { offset: -6, cohort: ctx.cohorts.a, instructor: ctx.people.instructor, room: HANGAR, time: "09:00", minutes: 90 },
    { offset: -14, cohort: ctx.cohorts.b, instructor: ctx.people.priya, room: ROOM2, time: "13:30", minutes: 90 },
    { offset: -7, cohort: ctx.cohorts.b, instructor: ctx.people.priya, room: ROOM2, time: "13:30", minutes: 120 },
  ];
  for (const [n, p] of past.entries()) {
    const s = await schedule(plan(n), ctx.day(p.offset), p.time, p.minutes, p.room, p.instructor, p.cohort);
    const attendees = await sequelize.query<{ id: string }>(
      `SELECT a.student_id AS id FROM session_attendees a JOIN people p ON p.id = a.student_id WHERE a.session_id = :s ORDER BY p.name`,
      { replacements: { s: s.id }, type: QueryTypes.SELECT, transaction: ctx.t },
    );
    await recordAttendance(
      chief,
      recordAttendanceSchema.parse({ sessionId: s.id, lines: attendees.map((a, i) => lineFor(n, i, a.id)) }),
      ctx.t,
    );
  }
  // Taught two and three days ago, attendance not yet recorded: shows on Tomasz's and Priya's Today.
  await schedule(plan(1), ctx.day(-3), "14:00", 60, HANGAR, ctx.people.instructor, ctx.cohorts.a);
  await schedule(plan(0), ctx.day(-2), "10:00", 60, ROOM2, ctx.people.priya, ctx.cohorts.b);

  // Upcoming: this week and next, both cohorts; one cancelled so the Timetable and feeds show it.
  const upcoming: [number, string, string, number, string, string, string][] = [
    [1, ctx.cohorts.a, "09:00", 90, HANGAR, ctx.people.instructor, plan(2)],
    [1, ctx.cohorts.b, "09:00", 90, ROOM2, ctx.people.priya, plan(0)],
    [2, ctx.cohorts.b, "13:30", 60, HANGAR, ctx.people.priya, plan(1)],
    [3, ctx.cohorts.a, "09:00", 120, HANGAR, ctx.people.instructor, plan(3)],
    [3, ctx.cohorts.a, "11:00", 60, HANGAR, ctx.people.chief, plan(0)], // back to back with the one before
    [5, ctx.cohorts.b, "10:00", 90, ROOM2, ctx.people.rafael, plan(2)],
    [8, ctx.cohorts.a, "09:00", 90, HANGAR, ctx.people.instructor, plan(1)],
    [9, ctx.cohorts.b, "13:30", 90, ROOM2, ctx.people.priya, plan(3)],
    [10, ctx.cohorts.a, "09:00", 120, ROOM2, ctx.people.instructor, plan(0)],
  ];
  let cancelled = false;
  for (const [offset, cohort, time, minutes, room, instructor, briefingId] of upcoming) {
    const s = await schedule(briefingId, ctx.day(offset), time, minutes, room, instructor, cohort);
    if (!cancelled && offset === 2) {
      await cancelSession(
        chief,
        { sessionId: s.id, reason: "Briefing room heating is being repaired; this session moves to next week." },
        ctx.t,
      );
      cancelled = true;
    }
  }
}
