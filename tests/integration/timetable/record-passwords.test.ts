import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { actAs, closeDb, makeSchool, TEST_PASSWORD } from "@/tests/helpers/factories";
import { amendEntryAction } from "@/app/(app)/timetable/actions";
import { waiveMakeupAction } from "@/app/(app)/ground-log/actions";
import { scheduleSession } from "@/db/access/timetable/schedule-session";
import { recordAttendance } from "@/db/access/ground-log/record-attendance";
import { listMakeupFor } from "@/db/access/ground-log/list-makeup";
import { scheduleSessionSchema, recordAttendanceSchema } from "@/lib/timetable/schema";
import { setClock, resetClock } from "@/lib/clock";
import { makeBriefing, addRooms } from "./helpers";

// Amending recorded attendance and waiving a make-up item change the training record, so the
// person signs them as a sign-off is signed: by re-entering their password. The right password
// writes; a wrong or missing one is refused naming the `password` field and writes nothing.

jest.mock("next/cache", () => ({ revalidatePath: jest.fn() }));

type School = Awaited<ReturnType<typeof makeSchool>>;
let s: School;
let atm: Awaited<ReturnType<typeof makeBriefing>>;

beforeAll(async () => {
  s = await makeSchool("pw");
  await addRooms(s, ["Hangar classroom"]);
  atm = await makeBriefing(s, "The standard atmosphere", ["ATM-01"]);
  setClock(() => new Date("2026-11-30T12:00:00Z"));
});
afterAll(async () => {
  actAs(null);
  resetClock();
  await closeDb();
});

/** A session of cohort A on `date`, its attendance recorded with the student absent; the student's entry. */
async function absentEntry(date: string, studentIndex: number): Promise<{ entryId: string; studentId: string; sessionId: string }> {
  const student = s.people.students[studentIndex]!;
  const input = scheduleSessionSchema.parse({
    briefingId: atm.id,
    date,
    time: "09:00",
    durationMinutes: 60,
    room: "Hangar classroom",
    instructorId: s.people.instructor.id,
    cohortId: s.cohorts.a.id,
  });
  const session = await sequelize.transaction((t) => scheduleSession(s.as.instructor, input, t));
  await sequelize.transaction((t) =>
    recordAttendance(
      s.as.instructor,
      recordAttendanceSchema.parse({ sessionId: session.id, lines: [{ studentId: student.id, status: "absent" }] }),
      t,
    ),
  );
  const [e] = await sequelize.query<{ id: string }>(`SELECT id FROM ground_log_entries WHERE session_id = :s AND student_id = :st`, {
    replacements: { s: session.id, st: student.id },
    type: QueryTypes.SELECT,
  });
  return { entryId: e!.id, studentId: student.id, sessionId: session.id };
}

/** What a refused change must leave as it was: the student's Ground log, their make-up items, the audit chain, the idempotency keys. */
async function snapshot(studentId: string) {
  const q = <T extends object>(sql: string) =>
    sequelize.query<T>(sql, { replacements: { st: studentId, s: s.school.id }, type: QueryTypes.SELECT });
  return {
    entries: await q(
      `SELECT id, status, credited_minutes, amends_entry_id, reason FROM ground_log_entries WHERE student_id = :st ORDER BY entry_no`,
    ),
    makeup: await q(`SELECT id, state, waived_reason, waived_by, closed_at FROM makeup_items WHERE student_id = :st ORDER BY id`),
    audit: await q(`SELECT count(*)::int AS n, max(chain_pos) AS head FROM audit_events WHERE school_id = :s`),
    keys: await q(`SELECT count(*)::int AS n FROM idempotency_keys k JOIN people p ON p.id = k.person_id WHERE p.school_id = :s`),
  };
}

describe("amending recorded attendance", () => {
  it("asks for the password: a wrong or missing one is refused naming the field and writes nothing", async () => {
    const { entryId, studentId } = await absentEntry("2026-11-23", 0);
    const before = await snapshot(studentId);
    actAs(s.as.instructor);
    const base = { entryId, status: "attended", reason: "Was in the room; register misread" };
    const wrong = await amendEntryAction({ ...base, password: "not-my-password", idempotencyKey: crypto.randomUUID() });
    expect(wrong).toMatchObject({ ok: false, status: 422, field: "password", fieldErrors: { password: ["does not match your password"] } });
    const missing = await amendEntryAction({ ...base, idempotencyKey: crypto.randomUUID() });
    expect(missing).toMatchObject({ ok: false, status: 400, field: "password", fieldErrors: { password: ["re-enter your password"] } });
    expect(await snapshot(studentId)).toEqual(before);
  });

  it("with the right password appends the amendment and closes the absence's make-up item", async () => {
    const { entryId, studentId, sessionId } = await absentEntry("2026-11-24", 1);
    expect((await listMakeupFor([studentId])).filter((m) => m.state === "open")).toHaveLength(1);
    actAs(s.as.instructor);
    const r = await amendEntryAction({
      entryId,
      status: "attended",
      reason: "Was in the room; register misread",
      password: TEST_PASSWORD,
      idempotencyKey: crypto.randomUUID(),
    });
    expect(r).toMatchObject({ ok: true });
    const chain = await sequelize.query<{ status: string; amends_entry_id: string | null }>(
      `SELECT status, amends_entry_id FROM ground_log_entries WHERE student_id = :st AND session_id = :s ORDER BY entry_no`,
      { replacements: { st: studentId, s: sessionId }, type: QueryTypes.SELECT },
    );
    expect(chain).toEqual([
      { status: "absent", amends_entry_id: null },
      { status: "attended", amends_entry_id: entryId },
    ]);
    expect((await listMakeupFor([studentId])).map((m) => m.state)).toEqual(["done"]);
  });
});

describe("waiving a make-up item", () => {
  it("asks for the chief's password: a wrong or missing one is refused naming the field and writes nothing", async () => {
    const { studentId } = await absentEntry("2026-11-25", 2);
    const [item] = (await listMakeupFor([studentId])).filter((m) => m.state === "open");
    const before = await snapshot(studentId);
    actAs(s.as.chief);
    const wrong = await waiveMakeupAction({ itemId: item!.id, reason: "Covered in the ATM workshop", password: "not-my-password" });
    expect(wrong).toMatchObject({ ok: false, status: 422, field: "password", fieldErrors: { password: ["does not match your password"] } });
    const missing = await waiveMakeupAction({ itemId: item!.id, reason: "Covered in the ATM workshop", password: "" });
    expect(missing).toMatchObject({ ok: false, status: 400, field: "password", fieldErrors: { password: ["re-enter your password"] } });
    expect(await snapshot(studentId)).toEqual(before);
  });

  it("with the right password waives the item with the reason, signed by the chief", async () => {
    const { studentId } = await absentEntry("2026-11-26", 2);
    const [item] = (await listMakeupFor([studentId])).filter((m) => m.state === "open");
    actAs(s.as.chief);
    const r = await waiveMakeupAction({ itemId: item!.id, reason: "Covered in the ATM workshop", password: TEST_PASSWORD });
    expect(r).toMatchObject({ ok: true, data: { id: item!.id, state: "waived" } });
    const [row] = await sequelize.query<{ state: string; waived_reason: string; waived_by: string }>(
      `SELECT state, waived_reason, waived_by FROM makeup_items WHERE id = :id`,
      { replacements: { id: item!.id }, type: QueryTypes.SELECT },
    );
    expect(row).toEqual({ state: "waived", waived_reason: "Covered in the ATM workshop", waived_by: s.people.chief.id });
  });
});
