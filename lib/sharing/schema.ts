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

const DAY_RE = /^(\d{4})-(\d{2})-(\d{2})$/;

/**
 * The chief records (or clears, with "") a student's date of birth. The age checks need the
 * school's today, so the server makes them (lib/sharing/consent.ts birthDateProblem); the
 * schema makes sure it is a real calendar date. Years before 1900 are refused here already.
 */
export const birthDateSchema = z.object({
  studentId: z.string().uuid("not a student id"),
  birthDate: z.string("a date as yyyy-mm-dd, or empty to clear it").refine((s) => {
    if (s === "") return true;
    const m = DAY_RE.exec(s);
    if (!m) return false;
    const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
    const day = new Date(Date.UTC(y, mo - 1, d));
    return y >= 1900 && day.getUTCFullYear() === y && day.getUTCMonth() === mo - 1 && day.getUTCDate() === d;
  }, "a real date as yyyy-mm-dd from 1900 on, or empty to clear it"),
});
export type BirthDateInput = z.infer<typeof birthDateSchema>;
