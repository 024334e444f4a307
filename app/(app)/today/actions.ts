"use server";
import { z } from "zod";
import { runAction } from "@/lib/actions/run-action";
import { unlockAccount } from "@/db/access/people/sign-in-locks";
import { HttpError } from "@/lib/http/errors";
import { revalidatePath } from "next/cache";

const unlockSchema = z.object({ personId: z.string().uuid() });

/** The chief instructor lifts the sign-in lock on an account of their school. */
export async function unlockAccountAction(input: unknown) {
  const result = await runAction("people.unlock", unlockSchema, input, async ({ personId }, { user }) => {
    const n = await unlockAccount(user.schoolId, personId);
    if (n === 0) throw new HttpError(404, "personId: no lock on that account", "personId");
    return { unlocked: n };
  });
  if (result.ok) revalidatePath("/today");
  return result;
}
