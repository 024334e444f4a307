import { z } from "zod";
import { calendarDate } from "@/lib/validation/dates";

// The Roster's input schemas, shared by the client forms and the server actions.

export const addStudentSchema = z
  .object({
    name: z.string().trim().min(1, "required").max(200),
    email: z.string().trim().toLowerCase().email("not a valid e-mail address"),
    cohortId: z.string().uuid("choose a cohort"),
    sponsorName: z.string().trim().max(200).optional().default(""),
    sponsorEmail: z
      .union([z.literal(""), z.string().trim().toLowerCase().email("not a valid e-mail address")])
      .optional()
      .default(""),
  })
  .refine((v) => !v.sponsorEmail || v.sponsorName, { message: "required when a sponsor e-mail is given", path: ["sponsorName"] })
  .refine((v) => !v.sponsorName || v.sponsorEmail, { message: "required when a sponsor name is given", path: ["sponsorEmail"] });

export const moveStudentSchema = z.object({
  studentId: z.string().uuid(),
  toCohortId: z.string().uuid("choose a cohort"),
  onDate: calendarDate(),
});
export type AddStudentInput = z.output<typeof addStudentSchema>;
export type MoveStudentInput = z.output<typeof moveStudentSchema>;
