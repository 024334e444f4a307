"use server";
import { revalidatePath } from "next/cache";
import { runAction } from "@/lib/actions/run-action";
import { saveRetentionSettings } from "@/db/access/retention/settings";
import { liftLegalHold, setLegalHold } from "@/db/access/retention/holds";
import { archiveRecord } from "@/db/access/retention/archive";
import { archiveSchema, liftHoldSchema, retentionSettingsSchema, setHoldSchema } from "@/lib/retention/schema";

/** Saves which retention rules apply to the school (the chief). */
export async function saveRetentionSettingsAction(input: unknown) {
  const r = await runAction("retention.manage", retentionSettingsSchema, input, async (data, { user, t }) =>
    saveRetentionSettings(t, user, data),
  );
  if (r.ok) revalidatePath("/retention");
  return r;
}

/** Sets a legal hold on a student's record, with its reason. */
export async function setLegalHoldAction(input: unknown) {
  const r = await runAction("retention.manage", setHoldSchema, input, async (data, { user, t }) => setLegalHold(t, user, data), {
    idempotent: "retention.hold",
  });
  if (r.ok) revalidatePath("/retention");
  return r;
}

/** Lifts a legal hold, with its reason. */
export async function liftLegalHoldAction(input: unknown) {
  const r = await runAction("retention.manage", liftHoldSchema, input, async (data, { user, t }) => liftLegalHold(t, user, data));
  if (r.ok) revalidatePath("/retention");
  return r;
}

/** Marks a record past its retention date archived (nothing is deleted). */
export async function archiveRecordAction(input: unknown) {
  const r = await runAction("retention.manage", archiveSchema, input, async (data, { user, t }) => archiveRecord(t, user, data));
  if (r.ok) revalidatePath("/retention");
  return r;
}
