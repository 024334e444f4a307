"use server";
import { revalidatePath } from "next/cache";
import { runAction } from "@/lib/actions/run-action";
import { recordOralCheck } from "@/db/access/records/record-oral-check";
import { amendOralCheck, withdrawOralCheck } from "@/db/access/records/oral-check-corrections";
import { signOff, withdrawSignOff, amendSignOff } from "@/db/access/records/sign-offs";
import { conductStageCheck, designateCheckInstructor } from "@/db/access/records/stage-checks";
import {
  recordCheckSchema,
  amendCheckSchema,
  withdrawCheckSchema,
  signOffSchema,
  withdrawSignOffSchema,
  amendSignOffSchema,
  stageCheckSchema,
  designateCheckInstructorSchema,
} from "@/lib/records/schema";

export async function recordCheckAction(input: unknown) {
  return runAction(
    "checks.record",
    recordCheckSchema,
    input,
    async (data, { user, t }) => {
      const r = await recordOralCheck(t, user, data);
      revalidatePath(`/records/${data.studentId}`);
      return r;
    },
    { idempotent: "check.record" },
  );
}

/**
 * Amends an oral check: the instructor who recorded it (or one who may manage records) records
 * the corrected check with a reason and their password; the original stays visible, amended.
 */
export async function amendCheckAction(input: unknown) {
  return runAction(
    "records.amend",
    amendCheckSchema,
    input,
    async (data, { user, t }) => {
      const r = await amendOralCheck(t, user, data);
      revalidatePath(`/records/${data.studentId}`);
      return r;
    },
    { idempotent: "check.amend" },
  );
}

export async function withdrawCheckAction(input: unknown) {
  return runAction("records.amend", withdrawCheckSchema, input, async (data, { user, t }) => withdrawOralCheck(t, user, data));
}

export async function signOffAction(input: unknown) {
  return runAction("records.sign", signOffSchema, input, async (data, { user, t }) => {
    const r = await signOff(t, user, data);
    revalidatePath(`/records/${data.studentId}`);
    return { id: r.id, itemCode: r.itemCode, signatureHash: r.signatureHash, generation: r.generation };
  });
}

export async function withdrawSignOffAction(input: unknown) {
  return runAction("records.amend", withdrawSignOffSchema, input, async (data, { user, t }) => withdrawSignOff(t, user, data));
}

export async function amendSignOffAction(input: unknown) {
  return runAction("records.amend", amendSignOffSchema, input, async (data, { user, t }) => {
    const r = await amendSignOff(t, user, data);
    return { id: r.id, signatureHash: r.signatureHash, generation: r.generation };
  });
}

export async function conductStageCheckAction(input: unknown) {
  return runAction("stagechecks.conduct", stageCheckSchema, input, async (data, { user, t }) => {
    const r = await conductStageCheck(t, user, data);
    revalidatePath(`/records/${data.studentId}`);
    return r;
  });
}

export async function designateCheckInstructorAction(input: unknown) {
  return runAction("stagechecks.designate", designateCheckInstructorSchema, input, async (data, { user, t }) =>
    designateCheckInstructor(t, user, data),
  );
}
