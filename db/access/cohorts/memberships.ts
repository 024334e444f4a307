import "server-only";
import type { Transaction } from "sequelize";
import { sequelize } from "../../index";
import { Cohort, CohortMembership } from "../../models";
import { HttpError } from "@/lib/http/errors";

// Cohorts and who belongs to them when: memberships are never rewritten, only ended.

export async function createCohort(
  input: { schoolId: string; courseId: string; name: string; leadInstructorId: string; startsOn: string },
  t?: Transaction,
) {
  const c = await Cohort.create(input, { transaction: t });
  return { id: c.id, name: c.name };
}

export async function addToCohort(input: { cohortId: string; studentId: string; fromDate: string }, t?: Transaction) {
  const m = await CohortMembership.create({ ...input, toDate: null }, { transaction: t });
  return { id: m.id };
}

/** Moves a student: the old membership ends the day the new one starts; history stays. */
export async function moveStudentToCohort(
  input: { schoolId: string; studentId: string; toCohortId: string; onDate: string },
  t: Transaction,
) {
  const target = await Cohort.findOne({ where: { id: input.toCohortId, schoolId: input.schoolId }, transaction: t });
  if (!target) throw new HttpError(404, "cohort: not found", "toCohortId");
  await sequelize.query(
    `UPDATE cohort_memberships SET to_date = :onDate WHERE student_id = :studentId AND to_date IS NULL AND from_date < :onDate`,
    { replacements: input, transaction: t },
  );
  return addToCohort({ cohortId: input.toCohortId, studentId: input.studentId, fromDate: input.onDate }, t);
}
