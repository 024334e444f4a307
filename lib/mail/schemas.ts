import { z } from "zod";

const noLineBreaks = (v: string) => !/[\r\n]/.test(v);

/** The school settings form (chief): one schema for the form and the server action. */
export const schoolSettingsSchema = z.object({
  mailSenderName: z.string().trim().max(80, "at most 80 characters").refine(noLineBreaks, "must be on one line"),
  reminderLeadHours: z.coerce
    .number({ error: "must be a number" })
    .int("whole hours")
    .min(1, "at least 1 hour")
    .max(168, "at most 168 hours (7 days)"),
  weeklyLetterDay: z.coerce.number({ error: "choose a day" }).int().min(0, "choose a day").max(6, "choose a day"),
  checkValidityDays: z.coerce.number({ error: "must be a number" }).int("whole days").min(1, "at least 1 day").max(365, "at most 365 days"),
  stageCheckPassMarkPercent: z.coerce
    .number({ error: "must be a number" })
    .int("whole percent")
    .min(1, "at least 1 %")
    .max(100, "at most 100 %"),
  lateEntryDays: z.coerce.number({ error: "must be a number" }).int("whole days").min(1, "at least 1 day").max(90, "at most 90 days"),
  authority: z.string().trim().max(100, "at most 100 characters").refine(noLineBreaks, "must be on one line"),
});
export type SchoolSettingsInput = z.input<typeof schoolSettingsSchema>;

export const sponsorNoteSchema = z.object({
  studentId: z.string().uuid("choose a student"),
  body: z.string().trim().min(1, "write the note").max(2000, "at most 2000 characters"),
});

export const retryMailSchema = z.object({ outboxId: z.string().uuid("not a mail id") });

export const WEEKDAYS = ["Sunday", "Monday", "Tuesday", "Wednesday", "Thursday", "Friday", "Saturday"] as const;
