"use server";
import { revalidatePath } from "next/cache";
import { runAction } from "@/lib/actions/run-action";
import { birthDateSchema, consentSchema } from "@/lib/sharing/schema";
import { changeConsent } from "@/db/access/sharing/change-consent";
import { setBirthDate } from "@/db/access/sharing/set-birth-date";

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

/** The chief records (or clears) a student's date of birth, which decides who manages their sponsor links. */
export async function setBirthDateAction(input: unknown) {
  const res = await runAction("sharing.birthdate", birthDateSchema, input, (data, { user, t }) => setBirthDate(user, data, t));
  if (res.ok) revalidatePath("/sharing/[studentId]", "page");
  return res;
}
