"use server";
import { revalidatePath } from "next/cache";
import { runAction } from "@/lib/actions/run-action";
import { addStudentSchema, moveStudentSchema } from "@/lib/roster/schema";
import { addStudentTx } from "@/db/access/roster/add-student";
import { moveStudent } from "@/db/access/roster/move-student";

/** Adds one student (and optionally their sponsor); new accounts get an invitation through the outbox. */
export async function addStudentAction(input: unknown) {
  const r = await runAction(
    "roster.manage",
    addStudentSchema,
    input,
    async (data, { user, t }) => {
      const res = await addStudentTx(user, data, t);
      return { studentId: res.studentId, invitations: res.invitations };
    },
    { idempotent: "roster.add" },
  );
  if (r.ok) revalidatePath("/roster");
  return r;
}

/** Moves a student to another cohort from a date; the old membership keeps its dates. */
export async function moveStudentAction(input: unknown) {
  const r = await runAction("roster.manage", moveStudentSchema, input, async (data, { user, t }) => {
    const m = await moveStudent(user, data, t);
    return { membershipId: m.id };
  });
  if (r.ok) revalidatePath("/roster");
  return r;
}
