"use server";
import { z } from "zod";
import { revalidatePath } from "next/cache";
import { runAction } from "@/lib/actions/run-action";
import { acknowledgeOralCheck } from "@/db/access/oral-checks";

/** The student acknowledges the debrief of their own oral check (recorded as an acknowledgement, not consent). */
export async function acknowledgeCheckAction(input: unknown) {
  return runAction("checks.acknowledge", z.object({ checkId: z.string().uuid("must be an id") }), input, async (data, { user, t }) => {
    const r = await acknowledgeOralCheck(t, user, data.checkId);
    revalidatePath(`/progress/${user.id}`);
    return r;
  });
}
