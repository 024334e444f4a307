import { z } from "zod";
import { calendarDate } from "@/lib/validation/dates";

// The Cohorts page's input schemas, shared by its forms and its server actions.

const uuid = (message: string) => z.string().uuid(message);
const cohortName = z
  .string()
  .transform((s) => s.replace(/\s+/g, " ").trim())
  .pipe(z.string().min(1, "required").max(100, "at most 100 characters"));

export const createCohortSchema = z.object({
  name: cohortName,
  courseId: uuid("choose a course"),
  leadInstructorId: uuid("choose a lead instructor"),
  startsOn: calendarDate(),
});
export type CreateCohortOutput = z.output<typeof createCohortSchema>;

export const renameCohortSchema = z.object({ cohortId: uuid("choose a cohort"), name: cohortName });
export type RenameCohortOutput = z.output<typeof renameCohortSchema>;

export const closeCohortSchema = z.object({ cohortId: uuid("choose a cohort"), closedOn: calendarDate() });
export type CloseCohortOutput = z.output<typeof closeCohortSchema>;

export const addMemberSchema = z.object({
  cohortId: uuid("choose a cohort"),
  studentId: uuid("choose a student"),
  fromDate: calendarDate(),
});
export type AddMemberOutput = z.output<typeof addMemberSchema>;

export const moveMemberSchema = z.object({
  studentId: uuid("choose a student"),
  toCohortId: uuid("choose a cohort"),
  onDate: calendarDate(),
});
export type MoveMemberOutput = z.output<typeof moveMemberSchema>;
