import type { Role } from "./roles";
import { rolesAllow } from "./permissions";

/**
 * Which students a caller may see, for a purpose: the one rule, as data. The data layer
 * (`db/access/shared/student-scope.ts`) turns it into SQL; nothing else decides it.
 *
 * - `records`: staff only (the school for the chief, taught students for an instructor);
 * - `examiner`: as records, plus every student of the school for a designated check instructor;
 * - `progress`, `groundlog`, `schedule`: staff, the student themself, and a linked sponsor to
 *   whom the student shares that kind of information;
 * - `mail`: a linked sponsor who receives the Weekly letter (what it carries is decided per share flag).
 */
export type ScopePurpose = "records" | "examiner" | "progress" | "groundlog" | "schedule" | "mail";

/** The sponsor_links flags that open a student to a sponsor, per purpose (all must be true). */
export const SPONSOR_SHARE_FLAGS: Record<ScopePurpose, readonly string[] | null> = {
  records: null,
  examiner: null,
  progress: ["shares_progress"],
  groundlog: ["shares_hours", "shares_attendance"],
  schedule: ["shares_schedule"],
  mail: ["weekly_letter"],
};

export interface StudentScope {
  /** every student of the caller's school */
  school: boolean;
  /** students the caller teaches: members of cohorts they lead, attendees of sessions they teach */
  taught: boolean;
  /** every student of the school when the caller is a designated check instructor */
  examiner: boolean;
  /** the caller themself, when a student */
  own: boolean;
  /** students linked to the caller as sponsor, with these share flags set */
  sponsored: readonly string[] | null;
}

export function studentScopeFor(roles: readonly Role[], purpose: ScopePurpose): StudentScope {
  const staffPurpose = purpose !== "mail";
  const selfPurpose = purpose === "progress" || purpose === "groundlog" || purpose === "schedule";
  const flags = SPONSOR_SHARE_FLAGS[purpose];
  return {
    school: staffPurpose && rolesAllow(roles, "students.all"),
    taught: staffPurpose && rolesAllow(roles, "students.taught"),
    examiner: purpose === "examiner" && rolesAllow(roles, "students.examine"),
    own: selfPurpose && rolesAllow(roles, "students.own"),
    sponsored: flags && (selfPurpose || purpose === "mail") && rolesAllow(roles, "students.sponsored") ? flags : null,
  };
}

/**
 * What a Weekly letter carries, section by section: the sponsor_links flags that must all be set
 * for the section to be read at all (the letter reaches a sponsor by purpose `mail`). The progress
 * and schedule sections follow the same flags as those purposes.
 */
export const WEEKLY_LETTER_SECTION_FLAGS = {
  attendance: ["shares_attendance"],
  hours: ["shares_hours"],
  progress: SPONSOR_SHARE_FLAGS.progress ?? [],
  outcomes: ["shares_outcomes"],
  nextWeek: SPONSOR_SHARE_FLAGS.schedule ?? [],
} as const satisfies Record<string, readonly string[]>;

export type WeeklyLetterSection = keyof typeof WEEKLY_LETTER_SECTION_FLAGS;

/** The sections a letter carries, given the sponsor link's flags (a missing flag counts as not shared). */
export function weeklyLetterSections(flags: Readonly<Record<string, boolean | undefined>>): Record<WeeklyLetterSection, boolean> {
  const open = (s: WeeklyLetterSection) =>
    WEEKLY_LETTER_SECTION_FLAGS[s].length > 0 && WEEKLY_LETTER_SECTION_FLAGS[s].every((f) => !!flags[f]);
  return {
    attendance: open("attendance"),
    hours: open("hours"),
    progress: open("progress"),
    outcomes: open("outcomes"),
    nextWeek: open("nextWeek"),
  };
}
