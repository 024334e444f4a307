"use server";
import { revalidatePath } from "next/cache";
import { runAction } from "@/lib/actions/run-action";
import { createAssignments } from "@/db/access/assignments/create";
import { setAssignmentDone } from "@/db/access/assignments/student-assignments";
import { assignmentSchema, completionSchema } from "@/lib/assignments/schema";

/** Assigns a briefing or a demo to a cohort or to students; each student gets an `assignment.new` mail in the same transaction. */
export async function createAssignmentAction(input: unknown) {
  const result = await runAction(
    "assignments.manage",
    assignmentSchema,
    input,
    async (data, { user, t }) =>
      createAssignments(
        user,
        {
          kind: data.kind,
          briefingId: data.briefingId,
          demoId: data.demoId,
          cohortId: data.cohortId,
          studentIds: data.studentIds,
          dueOn: data.dueOn,
          note: data.note,
        },
        t,
      ),
    { idempotent: "assignment.create" },
  );
  if (result.ok) revalidatePath("/assignments");
  return result;
}

/** A student marks one of their own assignments done, or not done again. */
export async function setAssignmentDoneAction(input: unknown) {
  const result = await runAction("assignments.complete", completionSchema, input, async ({ assignmentId, done }, { user, t }) =>
    setAssignmentDone(user, assignmentId, done, t),
  );
  if (result.ok) {
    revalidatePath("/assignments");
    revalidatePath("/today");
  }
  return result;
}
