"use server";
import { runAction } from "@/lib/actions/run-action";
import { endTrainingSchema } from "@/lib/completion/schema";
import { endTraining } from "@/db/access/completion/end-training";

/** The chief instructor ends a student's training (graduated, terminated, transferred) and certifies the record. */
export async function endTrainingAction(input: unknown) {
  return runAction("records.certify", endTrainingSchema, input, (data, { user, t }) => endTraining(t, user, data), {
    idempotent: "training.end",
  });
}
