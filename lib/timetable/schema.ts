import { z } from "zod";
import { calendarDate, wallClockTime } from "@/lib/validation/dates";
import { ATTENDANCE_WORDS } from "@/lib/labels";

// The Timetable's and the Ground log's input schemas, shared by the client forms and the server
// (server actions and route handlers parse with the same schema).

export const isoDate = calendarDate();
export const wallTime = wallClockTime();
const uuid = z.string().uuid("not a valid id");
/** a change of the record (an amended attendance, a waived make-up item) is signed by re-entering one's password */
const password = z.string("re-enter your password").min(1, "re-enter your password").max(200);

// A session's room: `roomId` from the school's list of rooms (the forms' select); `room`, a name
// that must match a room of the list once normalised, is still taken from older callers.
const roomFields = {
  roomId: z
    .union([z.literal(""), z.string().uuid("choose a room")])
    .optional()
    .default(""),
  room: z.string().trim().max(100, "at most 100 characters").optional().default(""),
};
const hasRoom = (v: { roomId: string; room: string }) => v.roomId !== "" || v.room !== "";
const roomMissing = { message: "choose a room", path: ["roomId"] };

export const scheduleSessionSchema = z
  .object({
    briefingId: z.string().uuid("choose a briefing"),
    date: isoDate,
    time: wallTime,
    durationMinutes: z.coerce.number().int("whole minutes").min(15, "at least 15 minutes").max(480, "at most 480 minutes"),
    ...roomFields,
    instructorId: z.string().uuid("choose an instructor"),
    cohortId: z
      .union([z.literal(""), uuid])
      .optional()
      .default(""),
    studentIds: z.array(uuid).max(200).optional().default([]),
  })
  .refine((v) => v.cohortId !== "" || v.studentIds.length > 0, { message: "choose a cohort or at least one student", path: ["cohortId"] })
  .refine(hasRoom, roomMissing);
export type ScheduleSessionInput = z.input<typeof scheduleSessionSchema>;
/** What the data layer takes: the parsed form, where the room is given by `roomId` or by `room` (a name). */
type RoomGiven<T> = Omit<T, "roomId" | "room"> & { roomId?: string; room?: string };
export type ScheduleSessionOutput = RoomGiven<z.output<typeof scheduleSessionSchema>>;

export const rescheduleSessionSchema = z
  .object({
    sessionId: uuid,
    date: isoDate,
    time: wallTime,
    durationMinutes: z.coerce.number().int("whole minutes").min(15, "at least 15 minutes").max(480, "at most 480 minutes"),
    ...roomFields,
    instructorId: z.string().uuid("choose an instructor"),
  })
  .refine(hasRoom, roomMissing);
export type RescheduleSessionOutput = RoomGiven<z.output<typeof rescheduleSessionSchema>>;

export const cancelSessionSchema = z.object({
  sessionId: uuid,
  reason: z.string().trim().min(3, "say why, in a few words").max(500, "at most 500 characters"),
});
export type CancelSessionOutput = z.output<typeof cancelSessionSchema>;

export const ATTENDANCE_STATUSES = ["attended", "late", "left_early", "absent_excused", "absent"] as const;
export type AttendanceStatusName = (typeof ATTENDANCE_STATUSES)[number];
/** Words for the statuses: the one label map (lib/labels.ts). */
export const ATTENDANCE_LABELS: Record<AttendanceStatusName, string> = ATTENDANCE_WORDS;

const minutes = z.coerce.number().int("whole minutes").min(0, "not negative").max(720, "at most 720");

export const attendanceLineSchema = z.object({
  studentId: uuid,
  status: z.enum(ATTENDANCE_STATUSES, "choose attended, late, left early or absent"),
  lateMinutes: minutes.optional().default(0),
  earlyMinutes: minutes.optional().default(0),
  /** when given, overrides the computed credit (never above the session's length) */
  creditedMinutes: z.union([z.literal(""), minutes]).optional(),
});
export type AttendanceLine = z.output<typeof attendanceLineSchema>;

export const recordAttendanceSchema = z.object({
  sessionId: uuid,
  lines: z.array(attendanceLineSchema).min(1, "record at least one student").max(200),
});
export type RecordAttendanceOutput = z.output<typeof recordAttendanceSchema>;

export const amendEntrySchema = attendanceLineSchema.omit({ studentId: true }).extend({
  entryId: uuid,
  reason: z.string().trim().min(3, "say what was wrong, in a few words").max(500),
  password,
});
export type AmendEntryOutput = z.output<typeof amendEntrySchema>;

export const makeupCloseSchema = z.object({
  itemId: uuid,
  how: z.enum(["one_to_one", "oral_check"], "choose a one-to-one briefing or an oral check"),
  note: z.string().trim().max(500).optional().default(""),
});
export const makeupScheduleSchema = z.object({ itemId: uuid, sessionId: uuid });
export const makeupWaiveSchema = z.object({ itemId: uuid, reason: z.string().trim().min(3, "say why, in a few words").max(500), password });
export type MakeupCloseOutput = z.output<typeof makeupCloseSchema>;
export type MakeupScheduleOutput = z.output<typeof makeupScheduleSchema>;
export type MakeupWaiveOutput = z.output<typeof makeupWaiveSchema>;

export const SESSION_SORTS = ["starts_at", "briefing", "room", "instructor", "cohort"] as const;

/** A filter sent empty ("Any instructor" of a GET form, `?cohort=`) is no filter. */
const emptyIsAbsent = (v: unknown) => (v === "" ? undefined : v);
function optionalFilter<T extends z.ZodType>(schema: T) {
  return z.preprocess(emptyIsAbsent, schema.optional());
}

/** GET /api/sessions and the list view's query string. Unknown parameters are refused by the caller. */
export const sessionsQuerySchema = z.object({
  from: optionalFilter(isoDate),
  to: optionalFilter(isoDate),
  instructor: optionalFilter(uuid),
  cohort: optionalFilter(uuid),
  room: optionalFilter(z.string().trim().min(1).max(100)),
  mine: optionalFilter(z.enum(["1", "0"], "1 or 0")),
  status: z.enum(["scheduled", "cancelled", "all"], "scheduled, cancelled or all").default("all"),
  sort: z.enum(SESSION_SORTS, `one of ${SESSION_SORTS.join(", ")}`).default("starts_at"),
  dir: z.enum(["asc", "desc"], "asc or desc").default("asc"),
  page: z.coerce.number("a whole number").int("a whole number").min(1, "at least 1").max(10_000).default(1),
  pageSize: z.coerce.number("a whole number").int("a whole number").min(1, "at least 1").max(100, "at most 100").default(20),
});
export type SessionsQuery = z.output<typeof sessionsQuerySchema>;
export const SESSIONS_QUERY_KEYS = Object.keys(sessionsQuerySchema.shape);

/** The week view's query string. */
export const weekQuerySchema = z.object({
  week: optionalFilter(isoDate),
  instructor: optionalFilter(uuid),
  cohort: optionalFilter(uuid),
  room: optionalFilter(z.string().trim().min(1).max(100)),
  mine: optionalFilter(z.enum(["1", "0"], "1 or 0")),
});
