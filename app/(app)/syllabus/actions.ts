"use server";
import { revalidatePath } from "next/cache";
import { runAction } from "@/lib/actions/run-action";
import { createSyllabusRevisionForSchool } from "@/db/access/syllabus/create-revision";
import { moveEnrolmentToRevision } from "@/db/access/syllabus/enrolments";
import { moveEnrolmentSchema, syllabusRevisionSchema } from "@/lib/syllabus/schema";

/** Makes the next syllabus revision of a course; earlier revisions and the enrolments on them stay as they are. */
export async function createSyllabusRevisionAction(input: unknown) {
  const result = await runAction(
    "syllabus.edit",
    syllabusRevisionSchema,
    input,
    async (data, { user, t }) => createSyllabusRevisionForSchool(user.schoolId, data, t),
    { idempotent: "syllabus.revision" },
  );
  if (result.ok) revalidatePath("/syllabus");
  return result;
}

/** Moves one student's enrolment to another revision of the same course. */
export async function moveEnrolmentAction(input: unknown) {
  const result = await runAction("syllabus.edit", moveEnrolmentSchema, input, async ({ enrolmentId, revisionId }, { user, t }) =>
    moveEnrolmentToRevision(user.schoolId, enrolmentId, revisionId, t),
  );
  if (result.ok) revalidatePath("/syllabus");
  return result;
}
