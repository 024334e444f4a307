import { z } from "zod";

// The briefing form's schema: the editor (react-hook-form) and the server action both use it.

const text = (field: string, max: number) => z.string().trim().max(max, `${field}: at most ${max} characters`);
const uuid = z.string().uuid();

export const elementSchema = z.object({
  title: text("Element", 200).min(1, "Give the element a title"),
  instructorActions: text("Instructor's actions", 4000).min(1, "Say what the instructor does"),
  studentActions: text("Students' actions", 4000).min(1, "Say what the students do"),
  minutes: z.coerce.number().int("Whole minutes").min(1, "At least 1 minute").max(480, "At most 480 minutes"),
});

export const briefingSchema = z.object({
  courseId: uuid,
  syllabusRevisionId: uuid,
  title: text("Title", 200).min(1, "Give the briefing a title"),
  objective: text("Objective", 4000).min(1, "State the objective"),
  syllabusItemIds: z.array(uuid).max(100).default([]),
  elements: z.array(elementSchema).min(1, "Add at least one element").max(40, "At most 40 elements"),
  equipment: text("Equipment", 2000).default(""),
  demoRevisionIds: z.array(uuid).max(20).default([]),
  completionStandard: text("Completion standard", 4000).min(1, "State the completion standard"),
  handoutIds: z.array(uuid).max(20).default([]),
  changeNote: text("Change note", 500).default(""),
});
export type BriefingFormInput = z.input<typeof briefingSchema>;
export type BriefingFormOutput = z.output<typeof briefingSchema>;

/** Creating is the schema alone; saving a new revision names the briefing too. */
export const reviseBriefingSchema = briefingSchema.extend({ briefingId: uuid });

/** Query parameters of the briefings list (page and GET /api/briefings). A bad one is a 400 naming it. */
export const briefingListQuery = z.object({
  q: z
    .string()
    .trim()
    .max(100, "at most 100 characters")
    .optional()
    .transform((v) => (v ? v : undefined)),
  item: z
    .string()
    .trim()
    .max(20, "at most 20 characters")
    .regex(/^[A-Za-z0-9-]*$/, "letters, digits and dashes only")
    .optional()
    .transform((v) => (v ? v : undefined)),
  sort: z.enum(["title", "updated", "minutes", "revision"]).default("updated"),
  dir: z.enum(["asc", "desc"]).default("desc"),
  page: z.coerce.number().int("a whole number").min(1, "at least 1").max(10000, "at most 10000").default(1),
  pageSize: z.coerce.number().int("a whole number").min(1, "at least 1").max(100, "at most 100").default(20),
});
export type BriefingListQueryInput = z.input<typeof briefingListQuery>;
