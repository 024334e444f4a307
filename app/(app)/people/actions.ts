"use server";
import { revalidatePath } from "next/cache";
import { runAction } from "@/lib/actions/run-action";
import { reviseQualification } from "@/db/access/people/qualification-history";
import { qualificationSchema, setAccountActiveSchema, linkSponsorSchema } from "@/lib/people/schema";
import { setAccountActive, linkSponsorToStudent } from "@/db/access/people/manage-accounts";

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

/** The chief deactivates (or reactivates) an account; its sessions end at once. */
export async function setAccountActiveAction(input: unknown) {
  const r = await runAction("people.manage", setAccountActiveSchema, input, async (data, { user, t }) => setAccountActive(user, data, t));
  if (r.ok) revalidatePath("/people");
  return r;
}

/** The chief links a sponsor to a student. */
export async function linkSponsorAction(input: unknown) {
  const r = await runAction("people.manage", linkSponsorSchema, input, async (data, { user, t }) => linkSponsorToStudent(user, data, t), {
    idempotent: "sponsor.link",
  });
  if (r.ok) revalidatePath("/people");
  return r;
}
