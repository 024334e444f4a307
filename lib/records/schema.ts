import { z } from "zod";
import { calendarDate as realDate, dateTime } from "@/lib/validation/dates";
import { LEVELS, QUESTION_OUTCOMES } from "./outcome";
import { WATCH_NOTE_KINDS } from "./watch-notes";
import { QUESTION_KINDS, AIRCRAFT_SOURCE_KINDS, ANSWER_MODES, type AircraftSourceKind, type QuestionKind } from "./questions";

// The Records area's zod schemas, used by both the server actions and the forms (and the
// register's query string). The oral-check form holds text fields; `checkFormSchema` checks
// them as typed, `checkFormToInput` turns them into the input that `recordCheckSchema` (the
// server's schema) accepts, and the form validates that input with `recordCheckSchema` too.

const uuid = z.string().uuid("must be an id");
const reason = z.string().trim().min(3, "give a reason of at least 3 characters").max(2000);
const isoDate = realDate();
const num = (max: number) => z.number().finite().min(0).max(max);
const password = z.string("re-enter your password").min(1, "re-enter your password").max(200);

// Nothing is chosen for the examiner: every outcome, level, element kind and result must be
// picked, and a missing one is refused with a message naming what to choose.
const MSG = {
  items: "choose at least one syllabus item",
  item: "choose the syllabus item of the question",
  level: "choose the level of learning shown",
  outcome: "choose the outcome: Solid, Shaky or Not yet",
  required: "choose whether the question is on a required element",
  questions: "record at least one question",
  result: "choose the result: pass or fail",
  oralOutcome: "choose the oral outcome of the item: Solid, Shaky or Not yet",
} as const;
const MAX_TEXT = 2000;
const MAX_REMARKS = 4000;
const MAX_MINUTES = 600;

// ---------------------------------------------------------------- oral checks

export const questionSchema = z.object({
  syllabusItemId: uuid,
  questionText: z.string().trim().max(MAX_TEXT).optional(),
  answerSummary: z.string().trim().max(MAX_TEXT).default(""),
  outcome: z.enum(QUESTION_OUTCOMES, MSG.outcome),
  required: z.boolean(MSG.required),
  prompted: z.boolean().default(false),
  correctiveGiven: z.boolean().default(false),
  generated: z
    .object({
      kind: z.enum(QUESTION_KINDS),
      aircraft: z.object({ kind: z.enum(AIRCRAFT_SOURCE_KINDS), id: z.string().min(1).max(100) }),
      inputs: z.object({
        massKg: num(100_000).optional(),
        altitudeFt: z.number().finite().min(-2000).max(60_000).optional(),
        speedKt: num(1000).optional(),
        heightFt: num(60_000).optional(),
      }),
      /** rule of thumb accepted or exact answer asked (lib/records/questions.ts); exact when absent */
      answerMode: z.enum(ANSWER_MODES).optional(),
    })
    .optional(),
  studentFigure: z.number().finite().nullable().optional(),
});

export const recordCheckSchema = z.object({
  studentId: uuid,
  itemIds: z.array(uuid).min(1, MSG.items).max(20),
  sessionId: uuid.nullable().optional(),
  levelShown: z.enum(LEVELS, MSG.level),
  remarks: z.string().trim().max(MAX_REMARKS).default(""),
  durationMinutes: z.number().int("whole minutes").min(1, "at least 1 minute").max(MAX_MINUTES),
  occurredAt: dateTime(),
  questions: z.array(questionSchema).min(1, MSG.questions).max(40),
  amends: z.object({ checkId: uuid, reason }).optional(),
});
export type RecordCheckInput = z.input<typeof recordCheckSchema>;

/** Amending an oral check: a new check that refers to the original, with a reason, signed with the password. */
export const amendCheckSchema = recordCheckSchema.extend({ amends: z.object({ checkId: uuid, reason }), password });
export type AmendCheckInput = z.input<typeof amendCheckSchema>;

/** Withdrawing an oral check: a correction of the record, signed as a sign-off is, with the password. */
export const withdrawCheckSchema = z.object({ checkId: uuid, reason, password });
export const acknowledgeCheckSchema = z.object({ checkId: uuid });

// ---------------------------------------------------------------- the oral-check form (text fields)

/** Whether a question is on a required element of the item (the form's choice). */
export const ELEMENT_KINDS = ["required", "optional"] as const;
export type ElementKind = (typeof ELEMENT_KINDS)[number];

const optionalNumber = z
  .string()
  .trim()
  .refine((v) => v === "" || Number.isFinite(Number(v)), "must be a number");

export const checkFormQuestionSchema = z
  .object({
    syllabusItemId: z.string(MSG.item).min(1, MSG.item),
    mode: z.enum(["written", "generated"]),
    questionText: z.string().max(MAX_TEXT),
    kind: z.enum(QUESTION_KINDS),
    aircraftKey: z.string(),
    massKg: optionalNumber,
    altitudeFt: optionalNumber,
    speedKt: optionalNumber,
    heightFt: optionalNumber,
    answerMode: z.enum(ANSWER_MODES),
    studentFigure: optionalNumber,
    answerSummary: z.string().max(MAX_TEXT),
    outcome: z.enum(QUESTION_OUTCOMES, MSG.outcome),
    /** "required" or "optional": chosen for every question, never preset */
    required: z.enum(ELEMENT_KINDS, MSG.required),
    prompted: z.boolean(),
    correctiveGiven: z.boolean(),
  })
  .superRefine((q, ctx) => {
    if (q.mode === "written" && q.questionText.trim() === "")
      ctx.addIssue({ code: "custom", path: ["questionText"], message: "write the question as asked" });
  });

export const checkFormSchema = z.object({
  itemIds: z.array(z.string()).min(1, MSG.items),
  levelShown: z.enum(LEVELS, MSG.level),
  durationMinutes: z
    .string()
    .regex(/^\d{1,3}$/, "whole minutes")
    .refine((v) => Number(v) >= 1 && Number(v) <= MAX_MINUTES, `1 to ${MAX_MINUTES} minutes`),
  occurredAt: z.string().min(1, "when did the check happen?"),
  sessionId: z.string(),
  remarks: z.string().max(MAX_REMARKS),
  questions: z.array(checkFormQuestionSchema).min(1, MSG.questions),
});
export type CheckFormValues = z.infer<typeof checkFormSchema>;
export type CheckFormQuestion = CheckFormValues["questions"][number];

const numberOrUndefined = (v: string) => (v.trim() === "" ? undefined : Number(v));

/** The generator inputs a form question holds (blank fields left out). */
export function generatorInputsOf(q: CheckFormQuestion) {
  return {
    massKg: numberOrUndefined(q.massKg),
    altitudeFt: numberOrUndefined(q.altitudeFt),
    speedKt: numberOrUndefined(q.speedKt),
    heightFt: numberOrUndefined(q.heightFt),
  };
}

/** The form's values as the server's input (what `recordCheckSchema` parses). */
export function checkFormToInput(studentId: string, v: CheckFormValues) {
  return {
    studentId,
    itemIds: v.itemIds,
    levelShown: v.levelShown,
    durationMinutes: Number(v.durationMinutes),
    occurredAt: new Date(v.occurredAt).toISOString(),
    sessionId: v.sessionId || null,
    remarks: v.remarks,
    questions: v.questions.map((q) => {
      const [kind, id] = q.aircraftKey.split(":");
      return {
        syllabusItemId: q.syllabusItemId,
        questionText: q.mode === "written" ? q.questionText : undefined,
        answerSummary: q.answerSummary,
        outcome: q.outcome,
        required: q.required === "required",
        prompted: q.prompted,
        correctiveGiven: q.correctiveGiven,
        generated:
          q.mode === "generated"
            ? {
                kind: q.kind as QuestionKind,
                aircraft: { kind: kind as AircraftSourceKind, id: id ?? "" },
                inputs: generatorInputsOf(q),
                answerMode: q.answerMode,
              }
            : undefined,
        studentFigure: q.mode === "generated" && q.studentFigure.trim() !== "" ? Number(q.studentFigure) : null,
      };
    }),
  };
}

// ---------------------------------------------------------------- sign-offs

export const signOffSchema = z.object({
  studentId: uuid,
  itemId: uuid,
  basisCheckId: uuid.optional(),
  signedOn: isoDate.optional(),
  password,
});

/** Withdrawing a sign-off: a correction of the record, signed with the password as the amendment is. */
export const withdrawSignOffSchema = z.object({ signOffId: uuid, reason, password });

export const amendSignOffSchema = z.object({
  signOffId: uuid,
  reason,
  basisCheckId: uuid.optional(),
  signedOn: isoDate.optional(),
  password,
});

// ---------------------------------------------------------------- stage checks

export const stageCheckSchema = z.object({
  studentId: uuid,
  stageId: uuid,
  result: z.enum(["pass", "fail"], MSG.result),
  oralOutcomes: z
    .array(z.object({ itemId: uuid, outcome: z.enum(QUESTION_OUTCOMES, MSG.oralOutcome), note: z.string().max(500).optional() }))
    .max(40),
  writtenScorePercent: z.number().finite().min(0, "0 to 100").max(100, "0 to 100").nullable().optional(),
  remarks: z.string().trim().max(MAX_REMARKS).default(""),
  occurredAt: dateTime(),
  overrideReason: z.string().trim().max(2000).optional(),
  /** the examiner signs the stage check as a sign-off is signed: re-entering the password */
  password,
});

// ---------------------------------------------------------------- watch-note reviews

/** The chief marks a watch note reviewed, with a remark (appended, never changed). */
export const reviewWatchNoteSchema = z.object({
  recordType: z.enum(["sign_off", "oral_check", "stage_check"], "choose the kind of record"),
  recordId: uuid,
  kind: z.enum(WATCH_NOTE_KINDS, "choose the watch note"),
  itemCode: z.string().trim().max(40).nullable().optional(),
  remark: z.string().trim().min(3, "write a remark of at least 3 characters").max(2000),
});

export const designateCheckInstructorSchema = z.object({ personId: uuid, checkInstructor: z.boolean() });

// ---------------------------------------------------------------- the Sign-off register's query string

const calendarDate = isoDate;
const emptyToUndefined = (v: unknown) => (v === "" ? undefined : v);

/** The Sign-off register's filters, from a query string; a bad one is refused naming it. */
export const registerQuerySchema = z
  .object({
    instructor: z.preprocess(emptyToUndefined, z.string().uuid("must be an instructor id").optional()),
    cohort: z.preprocess(emptyToUndefined, z.string().uuid("must be a cohort id").optional()),
    stage: z.preprocess(emptyToUndefined, z.string().uuid("must be a stage id").optional()),
    from: z.preprocess(emptyToUndefined, calendarDate.optional()),
    to: z.preprocess(emptyToUndefined, calendarDate.optional()),
    page: z.preprocess(
      emptyToUndefined,
      z.coerce.number().int("must be a whole number").min(1, "must be 1 or more").max(100_000, "must be 100000 or less").optional(),
    ),
  })
  .strict()
  .refine((q) => !q.from || !q.to || q.from <= q.to, { path: ["to"], message: "must be on or after from" });

export type RegisterQuery = z.output<typeof registerQuerySchema>;

export function toFilter(q: RegisterQuery) {
  return { instructorId: q.instructor, cohortId: q.cohort, stageId: q.stage, from: q.from, to: q.to };
}

// ---------------------------------------------------------------- the paged student lists' query string

/** The filters and page of a paged student list (Records, Progress map, Ground log), from a query string; a bad one is refused naming it. */
/**
 * Up to this many cohorts, a student list's cohort filter is a choice of names; a school with more
 * gets a "Cohort name contains" field instead, so the page does not grow with the number of cohorts.
 */
export const COHORT_CHOICES_MAX = 50;

export const studentListQuerySchema = z
  .object({
    cohort: z.preprocess(emptyToUndefined, z.string().uuid("must be a cohort id").optional()),
    cohortName: z.preprocess(emptyToUndefined, z.string().trim().max(100, "must be 100 characters or fewer").optional()),
    name: z.preprocess(emptyToUndefined, z.string().trim().max(100, "must be 100 characters or fewer").optional()),
    page: z.preprocess(
      emptyToUndefined,
      z.coerce.number().int("must be a whole number").min(1, "must be 1 or more").max(100_000, "must be 100000 or less").optional(),
    ),
  })
  .strict();

export type StudentListQuery = z.output<typeof studentListQuerySchema>;

/** The query string of a paged list filtered only by a part of the name (the Cohorts page, Accounts and roles). */
export const nameListQuerySchema = studentListQuerySchema.pick({ name: true, page: true }).strict();

export type NameListQuery = z.output<typeof nameListQuerySchema>;
