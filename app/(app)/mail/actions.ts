"use server";
import { revalidatePath } from "next/cache";
import { runAction } from "@/lib/actions/run-action";
import { retryMailSchema, sponsorNoteSchema } from "@/lib/mail/schemas";
import { addSponsorNote } from "@/db/access/mail/sponsor-notes";
import { retryFailedMail } from "@/db/access/mail/outbox-list";
import { sendLetterSchema } from "@/lib/sharing/schema";
import { sendLetterNow } from "@/lib/mail/producers";
import { now } from "@/lib/clock";

/** Puts a failed mail of the caller's school back in the queue. */
export async function retryMailAction(input: unknown) {
  const res = await runAction("mail.tray", retryMailSchema, input, (data, { user, t }) => retryFailedMail(user.schoolId, data.outboxId, t));
  if (res.ok) revalidatePath("/mail/outbox");
  return res;
}

/** A note for a student's sponsors; the next Weekly letter carries it. Instructors: their cohorts' students only. */
export async function addSponsorNoteAction(input: unknown) {
  const res = await runAction("sponsornotes.write", sponsorNoteSchema, input, (data, { user, t }) => addSponsorNote(user, data, t), {
    idempotent: "sponsor-note.add",
  });
  if (res.ok) revalidatePath("/mail/notes");
  return res;
}

/** The chief sends one sponsor's next Weekly letter about one student now (one letter per week however often clicked). */
export async function sendLetterNowAction(input: unknown) {
  const res = await runAction(
    "mail.letters",
    sendLetterSchema,
    input,
    (data, { user, t }) => sendLetterNow(t, user, data.sponsorId, data.studentId, now()),
    { idempotent: "weekly-letter.send-now" },
  );
  if (res.ok) revalidatePath("/mail/letters");
  return res;
}
