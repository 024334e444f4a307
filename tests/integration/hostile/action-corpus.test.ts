// A property-based corpus over server actions: arbitrary JSON (and objects with the actions' own
// keys holding values of the wrong type) never throws and never gives a 500: always a 4xx result
// naming the field at fault ("form" when the input is not an object at all), and no row written.
import fc from "fast-check";
import { QueryTypes } from "sequelize";
import { sequelize } from "@/db/index";
import { actAs, closeDb, makeSchool } from "@/tests/helpers/factories";
import {
  scheduleSessionAction,
  rescheduleSessionAction,
  cancelSessionAction,
  recordAttendanceAction,
  amendEntryAction,
} from "@/app/(app)/timetable/actions";
import { createAssignmentAction, setAssignmentDoneAction } from "@/app/(app)/assignments/actions";
import { createRoomAction, updateRoomAction, setRoomActiveAction } from "@/app/(app)/rooms/actions";
import { saveDemoAction, renameDemoAction, deleteDemoAction } from "@/app/(app)/curve-lab/actions";

jest.mock("next/cache", () => ({ revalidatePath: jest.fn() }));

type S = Awaited<ReturnType<typeof makeSchool>>;
let s: S;

beforeAll(async () => {
  s = await makeSchool("corpus");
});
afterAll(async () => {
  actAs(null);
  await closeDb();
});

const ACTIONS: [string, (input: unknown) => Promise<unknown>, string[]][] = [
  [
    "scheduleSession",
    scheduleSessionAction,
    ["briefingId", "date", "time", "durationMinutes", "room", "instructorId", "cohortId", "studentIds"],
  ],
  ["rescheduleSession", rescheduleSessionAction, ["sessionId", "date", "time", "durationMinutes", "room", "instructorId"]],
  ["cancelSession", cancelSessionAction, ["sessionId", "reason"]],
  ["recordAttendance", recordAttendanceAction, ["sessionId", "lines"]],
  ["amendEntry", amendEntryAction, ["entryId", "status", "reason", "password"]],
  ["createAssignment", createAssignmentAction, ["kind", "briefingId", "demoId", "cohortId", "studentIds", "dueOn", "note"]],
  ["setAssignmentDone", setAssignmentDoneAction, ["assignmentId", "done"]], // run as a student (the permission is theirs)
  ["createRoom", createRoomAction, ["name", "seats", "idempotencyKey"]],
  ["updateRoom", updateRoomAction, ["roomId", "name", "seats"]],
  ["setRoomActive", setRoomActiveAction, ["roomId", "active"]],
  ["saveDemo", saveDemoAction, ["demoId", "name", "spec"]],
  ["renameDemo", renameDemoAction, ["demoId", "name"]],
  ["deleteDemo", deleteDemoAction, ["demoId"]],
];

/** Anything JSON can carry except a string (a string alone may well be a valid name). */
const notAString = fc.oneof(
  fc.integer(),
  fc.double(),
  fc.boolean(),
  fc.constant(null),
  fc.array(fc.jsonValue(), { maxLength: 4 }),
  fc.dictionary(fc.string({ maxLength: 8 }), fc.jsonValue(), { maxKeys: 4 }),
);

const inputFor = (keys: string[]) =>
  fc.oneof(
    fc.jsonValue().filter((v) => v === null || typeof v !== "object" || Array.isArray(v)),
    fc.record(Object.fromEntries(keys.map((k) => [k, notAString])) as Record<string, typeof notAString>, { requiredKeys: [] }),
  );

async function rowCounts(): Promise<Record<string, number>> {
  const [r] = await sequelize.query<Record<string, number>>(
    `SELECT (SELECT count(*)::int FROM training_sessions WHERE school_id = :s) AS sessions,
            (SELECT count(*)::int FROM assignments WHERE school_id = :s) AS assignments,
            (SELECT count(*)::int FROM rooms WHERE school_id = :s) AS rooms,
            (SELECT count(*)::int FROM demos WHERE school_id = :s) AS demos,
            (SELECT count(*)::int FROM outbox WHERE school_id = :s) AS outbox,
            (SELECT count(*)::int FROM audit_events WHERE school_id = :s) AS audit,
            (SELECT count(*)::int FROM idempotency_keys WHERE person_id = :p) AS keys`,
    { replacements: { s: s.school.id, p: s.people.chief.id }, type: QueryTypes.SELECT },
  );
  return r!;
}

describe.each(ACTIONS)("%s", (name, action, keys) => {
  it("answers any malformed input with a 4xx naming a field, and writes nothing", async () => {
    actAs(name === "setAssignmentDone" ? s.as.student : s.as.chief);
    const before = await rowCounts();
    await fc.assert(
      fc.asyncProperty(inputFor(keys), async (input) => {
        const r = (await action(input)) as { ok: boolean; status?: number; field?: string };
        expect(r.ok).toBe(false);
        expect(r.status).toBeGreaterThanOrEqual(400);
        expect(r.status).toBeLessThan(500);
        expect(typeof r.field).toBe("string");
        const expected = input !== null && typeof input === "object" && !Array.isArray(input) ? [...keys, "form"] : ["form"];
        expect(expected).toContain(r.field!.split(".")[0]);
      }),
      { numRuns: 40 },
    );
    expect(await rowCounts()).toEqual(before);
  });
});
