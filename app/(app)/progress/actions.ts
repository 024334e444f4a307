"use server";
import { revalidatePath } from "next/cache";
import { runAction } from "@/lib/actions/run-action";
import { acknowledgeOralCheck } from "@/db/access/records/oral-check-corrections";
import { acknowledgeCheckSchema } from "@/lib/records/schema";

/** The student acknowledges the debrief of their own oral check (recorded as an acknowledgement, not consent). */
export async function acknowledgeCheckAction(input: unknown) {
  return runAction("checks.acknowledge", acknowledgeCheckSchema, input, async (data, { user, t }) => {
    const r = await acknowledgeOralCheck(t, user, data.checkId);
    revalidatePath(`/progress/${user.id}`);
    return r;
  });
}
