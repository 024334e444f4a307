jest.setTimeout(120_000);
import { sequelize } from "@/db/index";
import { makeSchool, closeDb } from "@/tests/helpers/factories";
import { scheduleSession } from "@/db/access/timetable/schedule-session";
import { recordAttendance } from "@/db/access/ground-log/record-attendance";
import { listMakeupFor } from "@/db/access/ground-log/list-makeup";
import { scheduleSessionSchema, recordAttendanceSchema } from "@/lib/timetable/schema";
import { makeBriefing, addRooms } from "@/tests/integration/timetable/helpers";
import { check, itemId } from "./helpers";

afterAll(closeDb);

it("the Ground log's make-up list names the passing oral check that closed an item, with the check's date", async () => {
  const s = await makeSchool("makeuplink");
  await addRooms(s, ["Hangar classroom"]);
  const st = s.people.students[0]!.id;
  const briefing = await makeBriefing(s, "Drag curves", ["AER-01", "AER-02"]);
  const session = await sequelize.transaction((t) =>
    scheduleSession(
      s.as.instructor,
      scheduleSessionSchema.parse({
        briefingId: briefing.id,
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
  await sequelize.transaction((t) =>
    recordAttendance(
      s.as.instructor,
      recordAttendanceSchema.parse({ sessionId: session.id, lines: [{ studentId: st, status: "absent" }] }),
      t,
    ),
  );
  const before = await listMakeupFor([st]);
  expect(before.map((m) => [m.itemCode, m.state, m.closedById, m.closedByCheckAt]).sort()).toEqual([
    ["AER-01", "open", null, null],
    ["AER-02", "open", null, null],
  ]);
  // a check meeting the standard on AER-01 only
  const occurredAt = new Date();
  const done = await check(s.as.instructor, st, [await itemId(s, "AER-01")], { occurredAt });
  const after = await listMakeupFor([st]);
  const closed = after.find((m) => m.itemCode === "AER-01")!;
  expect(closed).toMatchObject({ state: "done", closedByKind: "oral_check", closedById: done.id });
  expect(new Date(closed.closedByCheckAt!).getTime()).toBe(occurredAt.getTime());
  expect(after.find((m) => m.itemCode === "AER-02")).toMatchObject({
    state: "open",
    closedByKind: null,
    closedById: null,
    closedByCheckAt: null,
  });
});
