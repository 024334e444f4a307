// Consent and sponsors (pure): what a student can share with each sponsor, in our own words, and
// who decides. Consent to see (the share flags) is separate from consent to receive mail (the
// Weekly letter flag); a sponsor may also stop the letter themself (mail_unsubscribes), which the
// student's choice does not override.
//
// Minors: a student whose date of birth says they are under AGE_OF_MAJORITY has their sponsor
// links (their guardians) managed by the school. The minor sees who their guardians are and what
// each sees, but cannot withdraw a guardian's view; staff who keep the student's records change it.
// An adult student (or one with no date of birth on file) manages their own links; staff cannot
// override an adult's choice.

export const AGE_OF_MAJORITY = 18;

/** The sponsor_links columns a student decides, with the words the Sharing page uses. */
export const SHARE_CHOICES = [
  { key: "attendance", column: "shares_attendance", label: "Attendance", hint: "which sessions were attended, missed or excused" },
  { key: "hours", column: "shares_hours", label: "Ground hours", hint: "hours credited against the course minimum" },
  { key: "milestones", column: "shares_progress", label: "Milestones", hint: "items signed off, stage checks passed, make-ups to book" },
  { key: "outcomes", column: "shares_outcomes", label: "Check results", hint: "Solid, Shaky or Not yet from oral checks" },
  { key: "schedule", column: "shares_schedule", label: "Sessions ahead", hint: "dates, times and rooms of coming sessions" },
] as const;

export type ShareKey = (typeof SHARE_CHOICES)[number]["key"];
export type ShareColumn = (typeof SHARE_CHOICES)[number]["column"];

export interface Consent {
  attendance: boolean;
  hours: boolean;
  milestones: boolean;
  outcomes: boolean;
  schedule: boolean;
  /** consent to receive mail: the Weekly letter about this student goes to this sponsor */
  weeklyLetter: boolean;
}

/** The consent as sponsor_links columns. */
export function consentColumns(c: Consent): Record<ShareColumn | "weekly_letter", boolean> {
  return {
    shares_attendance: c.attendance,
    shares_hours: c.hours,
    shares_progress: c.milestones,
    shares_outcomes: c.outcomes,
    shares_schedule: c.schedule,
    weekly_letter: c.weeklyLetter,
  };
}

/** Everything withdrawn: the sponsor stays linked (and listed) but sees nothing and receives nothing. */
export const NOTHING_SHARED: Consent = {
  attendance: false,
  hours: false,
  milestones: false,
  outcomes: false,
  schedule: false,
  weeklyLetter: false,
};

/** Whether someone born on `birthDate` (yyyy-MM-dd, or null when not on file) is under age on `today` (yyyy-MM-dd). */
export function isMinor(birthDate: string | null, today: string): boolean {
  if (!birthDate) return false;
  const [y, m, d] = birthDate.split("-").map(Number) as [number, number, number];
  const comingOfAge = `${String(y + AGE_OF_MAJORITY).padStart(4, "0")}-${String(m).padStart(2, "0")}-${String(d).padStart(2, "0")}`;
  return today < comingOfAge;
}

export type ConsentManager = "student" | "school";

/** Who decides this student's sponsor links. */
export function consentManager(birthDate: string | null, today: string): ConsentManager {
  return isMinor(birthDate, today) ? "school" : "student";
}

/**
 * Whether the caller may change a student's sponsor links: the adult student themself, or, for a
 * minor, staff who keep the student's records (`staff` = the records scope opens the student).
 */
export function mayChangeConsent(manager: ConsentManager, caller: { isTheStudent: boolean; staff: boolean }): boolean {
  return manager === "student" ? caller.isTheStudent : caller.staff;
}

/**
 * The ages a date of birth on file may give: a ground-school student younger than this or older
 * than that is almost surely a typing slip in the year (common practice: sanity bounds, not a rule
 * of any authority).
 */
export const PLAUSIBLE_AGE = { min: 10, max: 100 } as const;

/** Whole years from `birthDate` to `today` (both yyyy-MM-dd). */
export function ageOn(birthDate: string, today: string): number {
  const [by, bm, bd] = birthDate.split("-").map(Number) as [number, number, number];
  const [ty, tm, td] = today.split("-").map(Number) as [number, number, number];
  return ty - by - (tm < bm || (tm === bm && td < bd) ? 1 : 0);
}

/** What is wrong with a date of birth (a real yyyy-MM-dd date) recorded on `today`, in words, or null. */
export function birthDateProblem(birthDate: string, today: string): string | null {
  if (birthDate > today) return "must not be in the future";
  const age = ageOn(birthDate, today);
  if (age < PLAUSIBLE_AGE.min) return `gives an age of ${age}, under ${PLAUSIBLE_AGE.min}: check the year`;
  if (age > PLAUSIBLE_AGE.max) return `gives an age of ${age}, over ${PLAUSIBLE_AGE.max}: check the year`;
  return null;
}
