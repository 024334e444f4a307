"use server";
import { revalidatePath } from "next/cache";
import { runAction } from "@/lib/actions/run-action";
import { reviseQualification } from "@/db/access/people/qualification-history";
import { qualificationSchema } from "@/lib/people/schema";

/** The chief adds a qualification or records a change to one; the version it replaces stays in the file. */
export async function saveQualificationAction(input: unknown) {
  const r = await runAction(
    "qualifications.manage",
    qualificationSchema,
    input,
    async (data, { user, t }) => reviseQualification(t, user, data),
    { idempotent: "qualification.save" },
  );
  if (r.ok && typeof input === "object" && input && "personId" in input) revalidatePath(`/people/${String(input.personId)}`);
  return r;
}
