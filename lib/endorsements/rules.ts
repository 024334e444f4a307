import { addMonths, format, parseISO, startOfMonth } from "date-fns";
import { formatDay } from "@/lib/time";

// Pure rules of knowledge-test endorsements: defaults of the authority settings, the statement the
// instructor signs, the pass decision and the reporting window.

export interface AuthoritySettings {
  authorityName: string;
  endorsementWording: string;
  passMarkPercent: number;
  resultValidityMonths: number;
  attemptLimit: number;
}

/** Used until the chief saves the school's own settings (invented demo values, not any authority's text). */
export const DEFAULT_AUTHORITY_SETTINGS: AuthoritySettings = {
  authorityName: "Ground school authority (set in Endorsement settings)",
  endorsementWording:
    "I have given {student} the ground training required for the {course} knowledge test and find the student prepared for it.",
  passMarkPercent: 70,
  resultValidityMonths: 24,
  attemptLimit: 3,
};

/** The school's wording with the student and course filled in. */
export function fillWording(wording: string, p: { student: string; course: string }): string {
  return wording.replaceAll("{student}", p.student).replaceAll("{course}", p.course);
}

export function endorsementStatement(p: { instructorName: string; wording: string; endorsedOn: string; authorityName: string }): string {
  return (
    `I, ${p.instructorName}, endorse as follows for the ${p.authorityName} knowledge test: "${p.wording}" ` +
    `I certify that every syllabus item and stage check of the course is complete, no make-up training is open, ` +
    `the credited ground hours meet the course minimum and I am qualified and current on ${formatDay(p.endorsedOn)}.`
  );
}

export function isPass(scorePercent: number, passMarkPercent: number): boolean {
  return scorePercent >= passMarkPercent;
}

/** Last day a passed result counts: `months` calendar months after the test (date-fns addMonths). */
export function resultValidUntil(takenOn: string, months: number): string {
  return format(addMonths(parseISO(takenOn), months), "yyyy-MM-dd");
}

/** The last 24 calendar months up to `today`: from the first day of the month 23 months back. */
export function passRateWindow(today: string, months = 24): { from: string; to: string } {
  return { from: format(startOfMonth(addMonths(parseISO(today), -(months - 1))), "yyyy-MM-dd"), to: today };
}

/** The share that keeps a school's approval in the report (14 CFR 141.5(d): 80 % on the first attempt). */
export const PASS_RATE_TARGET_PERCENT = 80;
