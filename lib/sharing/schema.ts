import { z } from "zod";

// One schema for the Sharing form and its server action.

const flag = z.boolean({ error: "must be yes or no" });

/** What a student shares with one sponsor, and whether that sponsor receives the Weekly letter. */
export const consentSchema = z.object({
  studentId: z.string().uuid("not a student id"),
  sponsorId: z.string().uuid("not a sponsor id"),
  attendance: flag,
  hours: flag,
  milestones: flag,
  outcomes: flag,
  schedule: flag,
  weeklyLetter: flag,
});
export type ConsentInput = z.infer<typeof consentSchema>;

/** A sponsor turns the Weekly letter about one student back on (after unsubscribing). */
export const resubscribeSchema = z.object({ studentId: z.string().uuid("not a student id") });

/** The chief sends a sponsor's next letter about one student now. */
export const sendLetterSchema = z.object({
  sponsorId: z.string().uuid("not a sponsor id"),
  studentId: z.string().uuid("not a student id"),
});
