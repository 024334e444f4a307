jest.setTimeout(120_000);
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { makeSchool, closeDb, TEST_PASSWORD } from "@/tests/helpers/factories";
import { scheduleSession } from "@/db/access/timetable/schedule-session";
import { recordAttendance } from "@/db/access/ground-log/record-attendance";
import { waiveMakeup } from "@/db/access/ground-log/change-makeup";
import { scheduleSessionSchema, recordAttendanceSchema } from "@/lib/timetable/schema";
import { signOffRegister } from "@/db/access/records/sign-off-register";
import { RecordRefusal } from "@/db/access/records/refusals";
import { makeBriefing, addRooms } from "@/tests/integration/timetable/helpers";
import { check, sign, itemId } from "./helpers";

afterAll(closeDb);

it("an item signed while the student missed its covering session with no completed make-up raises a watch note", async () => {
  const s = await makeSchool("missed");
  await addRooms(s, ["Hangar classroom"]);
  const st = s.people.students[0]!.id;
  const aer = await makeBriefing(s, "Drag curves", ["AER-01"]);
  const session = await sequelize.transaction((t) =>
    scheduleSession(
      s.as.instructor,
      scheduleSessionSchema.parse({
        briefingId: aer.id,
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
  const item = await itemId(s, "AER-01");
  await check(s.as.instructor, st, [item]);
  // the absence opened a make-up item: no sign-off yet
  await expect(sign(s.as.instructor, { studentId: st, itemId: item })).rejects.toMatchObject({
    reason: "makeup_open",
  } satisfies Partial<RecordRefusal>);
  const [m] = await sequelize.query<{ id: string }>(`SELECT id FROM makeup_items WHERE student_id = :st AND syllabus_item_id = :i`, {
    replacements: { st, i: item },
    type: QueryTypes.SELECT,
  });
  // the chief waives it: the item can be signed, but the register notes the missed session
  await sequelize.transaction((t) =>
    waiveMakeup(s.as.chief, { itemId: m!.id, reason: "Read the notes instead", password: TEST_PASSWORD }, t),
  );
  const so = await sign(s.as.instructor, { studentId: st, itemId: item });
  const { notes } = await signOffRegister(s.as.chief);
  expect(notes.filter((n) => n.recordId === so.id).map((n) => n.kind)).toEqual(["missed_session"]);
  // a cohort-mate who attended gets no such note
  const mate = s.people.students[1]!.id;
  await check(s.as.instructor, mate, [item]);
  const so2 = await sign(s.as.instructor, { studentId: mate, itemId: item });
  expect((await signOffRegister(s.as.chief)).notes.filter((n) => n.recordId === so2.id)).toEqual([]);
});
