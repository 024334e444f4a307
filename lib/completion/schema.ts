import { z } from "zod";
import { calendarDate } from "@/lib/validation/dates";

// End of training and withdrawal: the zod schemas used by the forms and the server actions
// (transfer credit's schema is lib/transfers/schema.ts).

export const END_KINDS = ["graduated", "terminated", "transferred"] as const;
export type EndKind = (typeof END_KINDS)[number];

const uuid = z.string().uuid("must be an id");
const password = z.string("re-enter your password").min(1, "re-enter your password").max(200);

export const endTrainingSchema = z.object({
  studentId: uuid,
  kind: z.enum(END_KINDS, "choose how training ended: graduated, terminated or transferred"),
  endedOn: calendarDate(),
  reason: z.string().trim().min(3, "give a reason of at least 3 characters").max(2000),
  /** the chief's certification statement as they accept it on the form */
  statement: z.string().trim().min(20, "the certification statement is required").max(4000),
  password,
});
export type EndTrainingInput = z.output<typeof endTrainingSchema>;

/** Withdrawing a student from their cohort on a date, with a reason (the enrolment on the course goes on). */
export const withdrawFromCohortSchema = z.object({
  studentId: uuid,
  leftOn: calendarDate({ required: "choose the date the student leaves the cohort" }),
  reason: z.string("give a reason").trim().min(3, "give a reason of at least 3 characters").max(2000, "at most 2000 characters"),
});
export type WithdrawFromCohortInput = z.output<typeof withdrawFromCohortSchema>;
