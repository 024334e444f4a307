import { z } from "zod";
import { calendarDate } from "@/lib/validation/dates";
import { nameListQuerySchema } from "@/lib/records/schema";

// The syllabus revision form's schema, shared by the editor and the server action; the query
// string of the revisions page's enrolment list.

const uuid = z.string().uuid();
const code = z
  .string()
  .trim()
  .min(1, "Give a code")
  .max(20, "At most 20 characters")
  .regex(/^[A-Za-z0-9-]+$/, "Letters, digits and dashes only");
const optionalDate = z.preprocess((v) => (v === "" || v === undefined ? null : v), calendarDate().nullable());

export const syllabusItemSchema = z.object({
  code,
  title: z.string().trim().min(1, "Give the item a title").max(200, "At most 200 characters"),
  objective: z.string().trim().min(1, "State the objective").max(2000, "At most 2000 characters"),
  completionStandard: z.string().trim().min(1, "State the completion standard").max(2000, "At most 2000 characters"),
  requiredLevel: z.enum(["rote", "understanding", "application", "correlation"]),
});

export const syllabusStageSchema = z.object({
  code,
  title: z.string().trim().min(1, "Give the stage a title").max(200, "At most 200 characters"),
  items: z.array(syllabusItemSchema).min(1, "A stage needs at least one item").max(100),
});

export const syllabusRevisionSchema = z.object({
  courseId: uuid,
  approvedOn: optionalDate,
  effectiveFrom: optionalDate,
  changeNote: z.string().trim().min(1, "Say what changed").max(500, "At most 500 characters"),
  stages: z.array(syllabusStageSchema).min(1, "Add at least one stage").max(30),
});
export type SyllabusRevisionFormInput = z.input<typeof syllabusRevisionSchema>;

export const moveEnrolmentSchema = z.object({ enrolmentId: uuid, revisionId: uuid });

/**
 * The query string of the Syllabus revisions page's enrolment list (the course is read on its
 * own): a part of the student's name, one revision, the page; a bad one is refused naming it.
 */
export const enrolmentListQuerySchema = nameListQuerySchema
  .extend({
    revision: z.preprocess((v) => (v === "" ? undefined : v), z.string().uuid("must be a revision id").optional()),
  })
  .strict();

export type EnrolmentListQuery = z.output<typeof enrolmentListQuerySchema>;
