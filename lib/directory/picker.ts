import { z } from "zod";
import type { Permission } from "@/lib/auth/permissions";
import type { ScopePurpose } from "@/lib/auth/student-scope";

// Pickers over sets that grow with the school (students, cohorts, accounts). Up to
// PICKER_LIST_MAX choices a form keeps its plain <select>; above it the form renders the
// search-as-you-type picker (components/search-picker.tsx), which asks /api/directory/* for at
// most PICKER_RESULTS names at a time. The server decides which, from one bounded query.

/** The most choices a form lists in a plain <select>; above it, the search picker. */
export const PICKER_LIST_MAX = 50;
/** The most results one search answers with (ordered by name). */
export const PICKER_RESULTS = 20;
/** The longest search text accepted. */
export const PICKER_QUERY_MAX = 80;

export interface PickerOption {
  id: string;
  name: string;
  /** a second line (a course code, "deactivated"); never needed to choose */
  detail?: string;
}

/** What a form gets for one picker: every choice (a small set) or "search" (a large one). */
export type PickerChoices<T extends PickerOption = PickerOption> = { kind: "list"; rows: T[] } | { kind: "search" };

/** The answer of GET /api/directory/*: at most PICKER_RESULTS rows, `more` when others match too. */
export interface PickerAnswer {
  rows: (PickerOption & { primary: string })[];
  more: boolean;
}

const q = z
  .string()
  .trim()
  .max(PICKER_QUERY_MAX, { error: `at most ${PICKER_QUERY_MAX} characters` })
  .optional()
  .default("");

/** Which students the picker lists, per form: each with the permission and scope of that form. */
export const STUDENT_PICKER_PURPOSES = ["schedule", "cohorts", "transfers", "sponsors", "endorsements", "notes", "assignments"] as const;
export type StudentPickerPurpose = (typeof STUDENT_PICKER_PURPOSES)[number];

/** Per purpose: the permission of the form that uses it and the student scope it reads through. */
export const STUDENT_PICKER_RULES: Record<
  StudentPickerPurpose,
  {
    permission: Permission;
    scope: ScopePurpose;
    /** active accounts only */
    activeOnly: boolean;
    /** students with an active enrolment only (with its course code as detail) */
    enrolledOnly: boolean;
    /** students with a linked sponsor only */
    sponsoredOnly?: boolean;
    /** students in a cohort now (its name as detail); a caller without students.all: a cohort they lead */
    inLedCohort?: boolean;
  }
> = {
  schedule: { permission: "timetable.schedule", scope: "schedule", activeOnly: true, enrolledOnly: false },
  cohorts: { permission: "cohorts.manage", scope: "records", activeOnly: true, enrolledOnly: false },
  transfers: { permission: "transfers.manage", scope: "records", activeOnly: true, enrolledOnly: true },
  sponsors: { permission: "people.manage", scope: "records", activeOnly: false, enrolledOnly: false },
  endorsements: { permission: "endorsements.sign", scope: "records", activeOnly: false, enrolledOnly: true },
  notes: { permission: "sponsornotes.write", scope: "records", activeOnly: true, enrolledOnly: false, sponsoredOnly: true },
  assignments: { permission: "assignments.manage", scope: "records", activeOnly: true, enrolledOnly: false, inLedCohort: true },
};

export const studentPickerQuery = z.object({
  q,
  purpose: z.enum(STUDENT_PICKER_PURPOSES, { error: `must be one of ${STUDENT_PICKER_PURPOSES.join(", ")}` }),
});

export const COHORT_PICKER_PURPOSES = ["timetable", "placing", "register", "assignments", "roster"] as const;
export type CohortPickerPurpose = (typeof COHORT_PICKER_PURPOSES)[number];

/**
 * Per purpose: the permission of the form that uses it, whether closed cohorts are left out, and
 * whether a caller without students.all sees only the cohorts they lead.
 */
export const COHORT_PICKER_RULES: Record<CohortPickerPurpose, { permission: Permission; openOnly: boolean; ledOnly?: boolean }> = {
  timetable: { permission: "timetable.schedule", openOnly: false },
  placing: { permission: "cohorts.manage", openOnly: true },
  register: { permission: "register.view", openOnly: false },
  assignments: { permission: "assignments.manage", openOnly: false, ledOnly: true },
  // the Roster's Add a student and Move forms (adding checks that the caller leads the cohort, or has roster.all)
  roster: { permission: "roster.manage", openOnly: true },
};

export const cohortPickerQuery = z.object({
  q,
  purpose: z.enum(COHORT_PICKER_PURPOSES, { error: `must be one of ${COHORT_PICKER_PURPOSES.join(", ")}` }),
});

/** Which instructors a picker lists, per form: each with the permission of that form. */
export const INSTRUCTOR_PICKER_PURPOSES = ["timetable", "register", "cohorts", "designate"] as const;
export type InstructorPickerPurpose = (typeof INSTRUCTOR_PICKER_PURPOSES)[number];

/**
 * Per purpose: the permission of the form that uses it, the permission whose holders are offered
 * (who may teach a session, sign records, lead a cohort) and whether deactivated accounts are left out.
 */
export const INSTRUCTOR_PICKER_RULES: Record<
  InstructorPickerPurpose,
  { permission: Permission; holders: Permission; activeOnly: boolean; qualifiedOnly?: boolean }
> = {
  // who may teach a session (TEACHING_ROLES)
  timetable: { permission: "timetable.schedule", holders: "attendance.record", activeOnly: true },
  // the register's signers and examiners, past ones too
  register: { permission: "register.view", holders: "records.sign", activeOnly: false },
  // a cohort's lead
  cohorts: { permission: "cohorts.manage", holders: "students.taught", activeOnly: true },
  // Records' Check instructors: instructors with a qualification in force, "check instructor" as detail when designated
  designate: { permission: "stagechecks.designate", holders: "students.taught", activeOnly: true, qualifiedOnly: true },
};

/** The detail a `designate` picker gives an instructor who is a designated check instructor already. */
export const DESIGNATED_DETAIL = "check instructor";

export const instructorPickerQuery = z.object({
  q,
  purpose: z.enum(INSTRUCTOR_PICKER_PURPOSES, { error: `must be one of ${INSTRUCTOR_PICKER_PURPOSES.join(", ")}` }),
});

/** `any`: every account of the school (with "deactivated" as detail); `sponsor`: those who may be linked as sponsor (students go through the student picker, purpose `sponsors`). */
export const PEOPLE_PICKER_ROLES = ["any", "sponsor"] as const;
export type PeoplePickerRole = (typeof PEOPLE_PICKER_ROLES)[number];

export const peoplePickerQuery = z.object({
  q,
  role: z.enum(PEOPLE_PICKER_ROLES, { error: `must be one of ${PEOPLE_PICKER_ROLES.join(", ")}` }).default("any"),
});

/** Rows read with LIMIT PICKER_LIST_MAX + 1 become the form's choices: the list, or "search". */
export function choicesFrom<T extends PickerOption>(rows: T[]): PickerChoices<T> {
  return rows.length > PICKER_LIST_MAX ? { kind: "search" } : { kind: "list", rows };
}

/** The knowledge-test result forms' choices: endorsements awaiting a result, open remedial items. */
export const ENDORSEMENT_PICKER_KINDS = ["awaiting", "remedial"] as const;
export type EndorsementPickerKind = (typeof ENDORSEMENT_PICKER_KINDS)[number];

export const endorsementPickerQuery = z.object({
  q,
  kind: z.enum(ENDORSEMENT_PICKER_KINDS, { error: `must be one of ${ENDORSEMENT_PICKER_KINDS.join(", ")}` }),
});
