import { z } from "zod";
import { calendarDate } from "@/lib/validation/dates";

// Knowledge-test endorsements: the input schemas shared by the forms and the server actions.

const uuid = z.string().uuid("not a valid id");
const optionalDay = z.preprocess((v) => (v === "" || v === null ? undefined : v), calendarDate().optional());
const whole = (min: number, max: number) =>
  z.coerce.number("a whole number").int("a whole number").min(min, `at least ${min}`).max(max, `at most ${max}`);

export const endorseSchema = z.object({
  studentId: uuid,
  /** the day the endorsement is for (school calendar); default today */
  endorsedOn: optionalDay,
  password: z.string().min(1, "required").max(200),
});
export type EndorseInput = z.output<typeof endorseSchema>;

/** Missed knowledge areas: one per line or comma, trimmed, empty ones dropped, no repeats. */
const areas = z.preprocess(
  (v) => (typeof v === "string" ? v.split(/[\n,]/) : v),
  z
    .array(z.string().trim().max(200, "at most 200 characters each"))
    .transform((a) => [...new Set(a.filter((x) => x.length > 0))])
    .pipe(z.array(z.string()).max(40, "at most 40 areas")),
);

export const recordResultSchema = z.object({
  endorsementId: uuid,
  takenOn: calendarDate({ required: "required" }),
  scorePercent: whole(0, 100),
  areasMissed: areas,
});
export type RecordResultInput = z.output<typeof recordResultSchema>;

export const completeRemedialSchema = z.object({
  remedialId: uuid,
  note: z.string().trim().min(3, "say what training was given").max(2000, "at most 2000 characters"),
});
export type CompleteRemedialInput = z.output<typeof completeRemedialSchema>;

export const authoritySettingsSchema = z.object({
  authorityName: z.string().trim().min(1, "required").max(100, "at most 100 characters"),
  endorsementWording: z.string().trim().min(20, "at least 20 characters").max(4000, "at most 4000 characters"),
  passMarkPercent: whole(1, 100),
  resultValidityMonths: whole(1, 120),
  attemptLimit: whole(1, 20),
});
export type AuthoritySettingsInput = z.output<typeof authoritySettingsSchema>;
