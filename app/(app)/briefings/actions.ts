"use server";
import { revalidatePath } from "next/cache";
import { runAction } from "@/lib/actions/run-action";
import { saveBriefingRevision } from "@/db/access/briefings/save-revision";
import { briefingSchema, reviseBriefingSchema } from "@/lib/briefings/schema";

/** Writes a new briefing and its first revision. */
export async function createBriefingAction(input: unknown) {
  const result = await runAction(
    "briefings.edit",
    briefingSchema,
    input,
    async (data, { user, t }) => saveBriefingRevision(user, null, data, t),
    { idempotent: "briefing.create" },
  );
  if (result.ok) revalidatePath("/briefings");
  return result;
}

/** Writes the next revision of a briefing; earlier revisions stay as they were. */
export async function reviseBriefingAction(input: unknown) {
  const result = await runAction(
    "briefings.edit",
    reviseBriefingSchema,
    input,
    async ({ briefingId, ...data }, { user, t }) => saveBriefingRevision(user, briefingId, data, t),
    { idempotent: "briefing.revise" },
  );
  if (result.ok) revalidatePath(`/briefings/${result.data.briefingId}`);
  return result;
}
