"use server";
import { runAction } from "@/lib/actions/run-action";
import { endTrainingSchema, withdrawFromCohortSchema } from "@/lib/completion/schema";
import { endTraining } from "@/db/access/completion/end-training";
import { closeMembershipsAtEnd, withdrawFromCohort } from "@/db/access/completion/withdraw-from-cohort";

/**
 * The chief instructor ends a student's training (graduated, terminated, transferred) and certifies
 * the record. Withdrawing a student from the course is this termination: the enrolment ends with its
 * date and reason and the record is certified (14 CFR 141.101(c) asks for it on termination too).
 * The student leaves their cohort on the same date.
 */
export async function endTrainingAction(input: unknown) {
  return runAction(
    "records.certify",
    endTrainingSchema,
    input,
    async (data, { user, t }) => {
      const res = await endTraining(t, user, data);
      const leftCohorts = await closeMembershipsAtEnd(t, user.schoolId, data.studentId, data.endedOn, data.reason);
      return { ...res, leftCohorts };
    },
    { idempotent: "training.end" },
  );
}

/** The chief withdraws a student from their cohort on a date, with a reason; the enrolment on the course goes on. */
export async function withdrawFromCohortAction(input: unknown) {
  return runAction("cohorts.manage", withdrawFromCohortSchema, input, async (data, { user, t }) => withdrawFromCohort(t, user, data), {
    idempotent: "cohort.withdraw",
  });
}
