"use server";
import { runAction } from "@/lib/actions/run-action";
import { practiceAnswerSchema, practiceTestSchema } from "@/lib/practice/schema";
import { answerPractice, submitPracticeTest } from "@/db/access/practice/attempts";

/** A student answers one practice question: scored at once on the server, stored as practice (never as an oral check). */
export async function answerPracticeAction(input: unknown) {
  return runAction("practice.take", practiceAnswerSchema, input, async (data, { user, t }) => answerPractice(user, data, t), {
    idempotent: "practice.answer",
  });
}

/** A student hands in a practice test: every answer scored, the share correct against the school's pass mark. */
export async function submitPracticeTestAction(input: unknown) {
  return runAction("practice.take", practiceTestSchema, input, async ({ answers }, { user, t }) => submitPracticeTest(user, answers, t), {
    idempotent: "practice.test",
  });
}
