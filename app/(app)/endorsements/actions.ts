"use server";
import { revalidatePath } from "next/cache";
import { runAction } from "@/lib/actions/run-action";
import { endorse } from "@/db/access/endorsements/endorse";
import { completeRemedial, recordResult } from "@/db/access/endorsements/results";
import { saveAuthoritySettings } from "@/db/access/endorsements/settings";
import { authoritySettingsSchema, completeRemedialSchema, endorseSchema, recordResultSchema } from "@/lib/endorsements/schema";

/** Endorses a student for the knowledge test; a refusal names every unmet precondition. */
export async function endorseAction(input: unknown) {
  const r = await runAction("endorsements.sign", endorseSchema, input, async (data, { user, t }) => endorse(t, user, data), {
    idempotent: "endorsement.create",
  });
  if (r.ok) revalidatePath("/endorsements");
  return r;
}

/** Records the result of the test taken on an endorsement; missed areas open remedial items. */
export async function recordResultAction(input: unknown) {
  const r = await runAction("endorsements.results", recordResultSchema, input, async (data, { user, t }) => recordResult(t, user, data), {
    idempotent: "endorsement.result",
  });
  if (r.ok) revalidatePath("/endorsements");
  return r;
}

/** Marks a remedial item done with a note of the training given. */
export async function completeRemedialAction(input: unknown) {
  const r = await runAction("endorsements.results", completeRemedialSchema, input, async (data, { user, t }) =>
    completeRemedial(t, user, data),
  );
  if (r.ok) revalidatePath("/endorsements");
  return r;
}

/** Saves the school's authority settings (the chief). */
export async function saveAuthoritySettingsAction(input: unknown) {
  const r = await runAction("endorsements.settings", authoritySettingsSchema, input, async (data, { user, t }) =>
    saveAuthoritySettings(t, user, data),
  );
  if (r.ok) revalidatePath("/endorsements/settings");
  return r;
}
