// The instructor's Today, "checks due": the items ready for an oral check are those taught in a
// session the student attended (attended, late or left early) with no satisfactory oral check yet
// (a check in force whose own result for the item meets the standard) and no sign-off; scoped to
// the students the caller teaches.
import { sequelize } from "@/db/index";
import { makeSchool, closeDb, TEST_PASSWORD } from "@/tests/helpers/factories";
import { makeBriefing, addRooms } from "@/tests/integration/timetable/helpers";
import { check, itemId, sign, type School } from "@/tests/integration/records/helpers";
import { scheduleSession } from "@/db/access/timetable/schedule-session";
import { recordAttendance } from "@/db/access/ground-log/record-attendance";
import { withdrawOralCheck } from "@/db/access/records/oral-check-corrections";
import { scheduleSessionSchema, recordAttendanceSchema } from "@/lib/timetable/schema";
import { oralChecksDue, oralChecksDueTop } from "@/db/access/today/oral-checks-due";
import { teachingWeek } from "@/db/access/today/teaching-week";

afterAll(closeDb);
jest.setTimeout(60_000);

let s: School;
let a3: string;
let a4: string;
const codesOf = (due: Awaited<ReturnType<typeof oralChecksDue>>, studentId: string) =>
  due.find((d) => d.studentId === studentId)?.items.map((i) => i.code);

beforeAll(async () => {
  s = await makeSchool("oraldue");
  [a3, a4] = [await itemId(s, "AER-03"), await itemId(s, "AER-04")];
  const b = await makeBriefing(s, "Drag and its two parts", ["AER-03", "AER-04"]);
  await addRooms(s, ["Hangar classroom"]);
  const session = await sequelize.transaction((t) =>
    scheduleSession(
      s.as.instructor,
      scheduleSessionSchema.parse({
        briefingId: b.id,
        date: "2026-11-20",
        time: "09:00",
        durationMinutes: 60,
        room: "Hangar classroom",
        instructorId: s.people.instructor.id,
        cohortId: s.cohorts.a.id,
      }),
      t,
    ),
  );
  const [st0, st1, st2] = s.people.students.map((p) => p.id);
  await sequelize.transaction((t) =>
    recordAttendance(
      s.as.instructor,
      recordAttendanceSchema.parse({
        sessionId: session.id,
        lines: [
          { studentId: st0, status: "attended" },
          { studentId: st1, status: "absent" },
          { studentId: st2, status: "late", lateMinutes: 10 },
        ],
      }),
      t,
    ),
  );
});

describe("items ready for an oral check", () => {
  it("lists the items taught to the students who attended (late counts), not to the one absent", async () => {
    const [st0, st1, st2] = s.people.students.map((p) => p.id);
    const due = await oralChecksDue(s.as.instructor);
    expect(codesOf(due, st0!)).toEqual(["AER-03", "AER-04"]);
    expect(codesOf(due, st2!)).toEqual(["AER-03", "AER-04"]);
    expect(codesOf(due, st1!)).toBeUndefined();
    // on the instructor's Today with the rest of the checks due
    const week = await teachingWeek(s.as.instructor);
    expect(week.oralChecksDue.map((d) => d.studentId).sort()).toEqual([st0, st2].sort());
    expect(week.oralChecksDueTotal).toBe(2);
    // bounded in SQL: the first student by name with every one of their items, and the number of students in all
    const top = await oralChecksDueTop(s.as.instructor, 1);
    expect(top.total).toBe(2);
    expect(top.students).toEqual(due.slice(0, 1));
    expect(top.students[0]!.items.length).toBe(2);
  });

  it("an item leaves the list once a check in force meets the standard on it; Not yet or a withdrawn check keeps it", async () => {
    const [st0, , st2] = s.people.students.map((p) => p.id);
    // AER-03 meets, AER-04 Not yet (each item's own result in the one check)
    await check(s.as.instructor, st0!, [a3, a4], {
      questions: [a3, a4].map((id) => ({
        syllabusItemId: id,
        questionText: "Explain it",
        answerSummary: "explained",
        outcome: id === a3 ? "solid" : "not_yet",
        required: true,
        prompted: false,
        correctiveGiven: false,
      })),
    });
    expect(codesOf(await oralChecksDue(s.as.instructor), st0!)).toEqual(["AER-04"]);
    // a check meeting the standard on both, then withdrawn: both stay due
    const c = await check(s.as.instructor, st2!, [a3, a4]);
    expect(codesOf(await oralChecksDue(s.as.instructor), st2!)).toBeUndefined();
    await sequelize.transaction((t) =>
      withdrawOralCheck(t, s.as.chief, { checkId: c.id, reason: "recorded for the wrong student", password: TEST_PASSWORD }),
    );
    expect(codesOf(await oralChecksDue(s.as.instructor), st2!)).toEqual(["AER-03", "AER-04"]);
  });

  it("a signed-off item is not due; another instructor who neither taught nor leads the students sees none of them", async () => {
    const [st0] = s.people.students.map((p) => p.id);
    const c = await check(s.as.instructor, st0!, [a4]);
    await sign(s.as.instructor, { studentId: st0!, itemId: a4, basisCheckId: c.id });
    expect(codesOf(await oralChecksDue(s.as.instructor), st0!)).toBeUndefined();
    const theirs = await oralChecksDue(s.as.instructor2);
    expect(theirs.filter((d) => s.people.students.slice(0, 3).some((p) => p.id === d.studentId))).toEqual([]);
  });
});
