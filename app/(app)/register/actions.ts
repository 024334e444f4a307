"use server";
import { revalidatePath } from "next/cache";
import { runAction } from "@/lib/actions/run-action";
import { recentWatchNotes } from "@/db/access/records/sign-off-register";
import { reviewWatchNote } from "@/db/access/records/watch-note-reviews";
import { reviewWatchNoteSchema } from "@/lib/records/schema";

/** The chief marks a watch note reviewed with a remark (appended and audited, never deleted). */
export async function reviewWatchNoteAction(input: unknown) {
  return runAction("register.review", reviewWatchNoteSchema, input, async (data, { user, t }) => {
    const notes = await recentWatchNotes(user);
    const r = await reviewWatchNote(t, user, data, notes);
    revalidatePath("/register");
    return r;
  });
}
