"use server";
import { revalidatePath } from "next/cache";
import { runAction } from "@/lib/actions/run-action";
import { consentSchema } from "@/lib/sharing/schema";
import { changeConsent } from "@/db/access/sharing/change-consent";

/** An adult student decides what one sponsor sees and whether they receive the Weekly letter. */
export async function changeSharingAction(input: unknown) {
  const res = await runAction("sharing.manage", consentSchema, input, (data, { user, t }) => changeConsent(user, data, t));
  if (res.ok) revalidatePath("/sharing");
  return res;
}

/** Staff who keep a student's records manage the sponsor links of a student under 18. */
export async function changeStudentSharingAction(input: unknown) {
  const res = await runAction("sharing.students", consentSchema, input, (data, { user, t }) => changeConsent(user, data, t));
  if (res.ok) revalidatePath("/sharing/[studentId]", "page");
  return res;
}
