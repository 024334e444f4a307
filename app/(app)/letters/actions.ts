"use server";
import { revalidatePath } from "next/cache";
import { runAction } from "@/lib/actions/run-action";
import { resubscribeSchema } from "@/lib/sharing/schema";
import { resubscribeLetter } from "@/db/access/sponsoring/letters";

/** A sponsor turns the Weekly letter about one student back on after stopping it. */
export async function resumeLetterAction(input: unknown) {
  const res = await runAction("letters.received", resubscribeSchema, input, (data, { user, t }) =>
    resubscribeLetter(user, data.studentId, t),
  );
  if (res.ok) revalidatePath("/today");
  return res;
}
