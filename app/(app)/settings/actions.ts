"use server";
import { revalidatePath } from "next/cache";
import { runAction } from "@/lib/actions/run-action";
import { schoolSettingsSchema } from "@/lib/mail/schemas";
import { updateSchoolSettings } from "@/db/access/mail/school-settings";

/** Saves the school's settings: mail sender, reminder lead time, letter day and the record limits. */
export async function saveSchoolSettingsAction(input: unknown) {
  const res = await runAction("settings.edit", schoolSettingsSchema, input, async (data, { user, t }) => {
    await updateSchoolSettings(user.schoolId, { ...data, mailSenderName: data.mailSenderName || undefined }, t);
    return { saved: true as const };
  });
  if (res.ok) revalidatePath("/settings");
  return res;
}
