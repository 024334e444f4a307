"use server";
import { revalidatePath } from "next/cache";
import { z } from "zod";
import { runAction } from "@/lib/actions/run-action";
import { scheduleSession } from "@/db/access/timetable/schedule-session";
import { rescheduleSession } from "@/db/access/timetable/reschedule-session";
import { cancelSession } from "@/db/access/timetable/cancel-session";
import { resetCalendarToken } from "@/db/access/timetable/calendar-feed";
import { recordAttendance } from "@/db/access/ground-log/record-attendance";
import { amendEntry } from "@/db/access/ground-log/amend-entry";
import {
  scheduleSessionSchema,
  rescheduleSessionSchema,
  cancelSessionSchema,
  recordAttendanceSchema,
  amendEntrySchema,
} from "@/lib/timetable/schema";

/** Schedules a session of a briefing; a double-booking comes back as a 409 naming who or what is busy. */
export async function scheduleSessionAction(input: unknown) {
  const r = await runAction(
    "timetable.schedule",
    scheduleSessionSchema,
    input,
    async (data, { user, t }) => {
      const s = await scheduleSession(user, data, t);
      return { id: s.id, attendeeCount: s.attendeeCount };
    },
    { idempotent: "session.schedule" },
  );
  if (r.ok) revalidatePath("/timetable");
  return r;
}

/** Moves a session; attendees are told through the outbox. */
export async function rescheduleSessionAction(input: unknown) {
  const r = await runAction(
    "timetable.schedule",
    rescheduleSessionSchema,
    input,
    async (data, { user, t }) => {
      const s = await rescheduleSession(user, data, t);
      return { id: s.id, sequence: s.sequence, told: s.told };
    },
    { idempotent: "session.reschedule" },
  );
  if (r.ok) revalidatePath("/timetable");
  return r;
}

/** Cancels a session with a reason; attendees are told through the outbox. */
export async function cancelSessionAction(input: unknown) {
  const r = await runAction("timetable.schedule", cancelSessionSchema, input, async (data, { user, t }) => cancelSession(user, data, t), {
    idempotent: "session.cancel",
  });
  if (r.ok) revalidatePath("/timetable");
  return r;
}

/** Records attendance and credited minutes after a session: one Ground log entry per student. */
export async function recordAttendanceAction(input: unknown) {
  const r = await runAction(
    "attendance.record",
    recordAttendanceSchema,
    input,
    async (data, { user, t }) => {
      const res = await recordAttendance(user, data, t);
      return { recorded: res.recorded };
    },
    { idempotent: "attendance.record" },
  );
  if (r.ok) revalidatePath("/timetable");
  return r;
}

/** Corrects a Ground log entry by appending an amendment; the original stays. */
export async function amendEntryAction(input: unknown) {
  const r = await runAction("attendance.record", amendEntrySchema, input, async (data, { user, t }) => amendEntry(user, data, t), {
    idempotent: "attendance.amend",
  });
  if (r.ok) revalidatePath("/timetable");
  return r;
}

/** Gives the caller a new secret calendar feed link; the old one stops working. */
export async function resetCalendarTokenAction(input: unknown) {
  return runAction("timetable.view", z.object({}).strict(), input ?? {}, async (_data, { user, t }) => {
    const { path } = await resetCalendarToken(user, t);
    return { path };
  });
}
