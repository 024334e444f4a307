import { z } from "zod";

// Retention: the input schemas shared by the forms and the server actions.

const uuid = z.string().uuid("not a valid id");
const reason = z.string().trim().min(3, "give the reason (at least 3 characters)").max(2000, "at most 2000 characters");

export const retentionSettingsSchema = z
  .object({
    schoolRecords: z.boolean(),
    instructorRecords: z.boolean(),
    easaAto: z.boolean(),
  })
  .refine((v) => v.schoolRecords || v.instructorRecords || v.easaAto, {
    message: "choose at least one rule",
    path: ["schoolRecords"],
  });
export type RetentionSettingsInput = z.output<typeof retentionSettingsSchema>;

export const setHoldSchema = z.object({ studentId: uuid, reason });
export type SetHoldInput = z.output<typeof setHoldSchema>;

export const liftHoldSchema = z.object({ holdId: uuid, reason });
export type LiftHoldInput = z.output<typeof liftHoldSchema>;

export const archiveSchema = z.object({ studentId: uuid });
export type ArchiveInput = z.output<typeof archiveSchema>;
