import { z } from "zod";
import { calendarDate } from "@/lib/validation/dates";

// The assignment form's schema, shared by the form and the server action.

const uuid = z.string().uuid();
const emptyToNull = (v: unknown) => (v === "" || v === undefined ? null : v);

export const assignmentSchema = z
  .object({
    kind: z.enum(["briefing", "demo"]),
    briefingId: z.preprocess(emptyToNull, uuid.nullable()),
    demoId: z.preprocess(emptyToNull, uuid.nullable()),
    cohortId: z.preprocess(emptyToNull, uuid.nullable()),
    studentIds: z.array(uuid).max(200).default([]),
    dueOn: calendarDate({ required: "Choose a date" }),
    note: z.string().trim().max(500, "At most 500 characters").default(""),
  })
  .superRefine((v, ctx) => {
    if (v.kind === "briefing" && !v.briefingId) ctx.addIssue({ code: "custom", path: ["briefingId"], message: "Choose a briefing" });
    if (v.kind === "demo" && !v.demoId) ctx.addIssue({ code: "custom", path: ["demoId"], message: "Choose a demo" });
    if (!v.cohortId && v.studentIds.length === 0)
      ctx.addIssue({ code: "custom", path: ["cohortId"], message: "Choose a cohort or at least one student" });
    if (v.cohortId && v.studentIds.length > 0)
      ctx.addIssue({ code: "custom", path: ["studentIds"], message: "Choose a cohort or students, not both" });
  });
export type AssignmentFormInput = z.input<typeof assignmentSchema>;

export const completionSchema = z.object({ assignmentId: uuid, done: z.boolean() });
