"use server";
import { revalidatePath } from "next/cache";
import { runAction } from "@/lib/actions/run-action";
import { scheduleMakeup, closeMakeup, waiveMakeup } from "@/db/access/ground-log/change-makeup";
import { makeupScheduleSchema, makeupCloseSchema, makeupWaiveSchema } from "@/lib/timetable/schema";

/** Plans an open make-up item into an upcoming session the student attends. */
export async function scheduleMakeupAction(input: unknown) {
  const r = await runAction("attendance.record", makeupScheduleSchema, input, async (data, { user, t }) => scheduleMakeup(user, data, t));
  if (r.ok) revalidatePath("/ground-log");
  return r;
}

/** Closes a make-up item by a one-to-one briefing or by self-study closed with an oral check. */
export async function closeMakeupAction(input: unknown) {
  const r = await runAction("attendance.record", makeupCloseSchema, input, async (data, { user, t }) => closeMakeup(user, data, t));
  if (r.ok) revalidatePath("/ground-log");
  return r;
}

/** The chief instructor waives a make-up item with a reason. */
export async function waiveMakeupAction(input: unknown) {
  const r = await runAction("makeup.waive", makeupWaiveSchema, input, async (data, { user, t }) => waiveMakeup(user, data, t));
  if (r.ok) revalidatePath("/ground-log");
  return r;
}
