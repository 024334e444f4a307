import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { requireCohortManager } from "./manage-cohorts";
import { HttpError } from "@/lib/http/errors";
import { formatDay } from "@/lib/time";
import type { CurrentUser } from "@/lib/auth/session";
import type { AddMemberOutput, MoveMemberOutput } from "@/lib/cohorts/schema";

// Dated cohort membership: a student belongs to at most one cohort on any date (the exclusion
// constraint of cohort_memberships). A refusal of that constraint is a 400 naming the date field.

async function openCohort(user: CurrentUser, cohortId: string, field: string, onDate: string, t: Transaction) {
  const [c] = await sequelize.query<{ id: string; name: string; startsOn: string; closedOn: string | null }>(
    `SELECT id, name, starts_on::text AS "startsOn", closed_on::text AS "closedOn" FROM cohorts WHERE id = :id AND school_id = :s`,
    { replacements: { id: cohortId, s: user.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!c) throw new HttpError(404, `${field}: no such cohort at this school`, field);
  if (c.closedOn && onDate >= c.closedOn) throw new HttpError(409, `${field}: ${c.name} is closed from ${formatDay(c.closedOn)}`, field);
  return c;
}

async function requireStudent(user: CurrentUser, studentId: string, t: Transaction) {
  const [p] = await sequelize.query<{ id: string; name: string }>(
    `SELECT id, name FROM people WHERE id = :p AND school_id = :s AND 'student' = ANY(roles)`,
    { replacements: { p: studentId, s: user.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!p) throw new HttpError(404, "studentId: no such student at this school", "studentId");
  return p;
}

async function insertMembership(cohortId: string, studentId: string, fromDate: string, field: string, t: Transaction) {
  try {
    return await sequelize.transaction({ transaction: t }, async (sp) => {
      const [row] = await sequelize.query<{ id: string }>(
        `INSERT INTO cohort_memberships (cohort_id, student_id, from_date) VALUES (:c, :p, :d) RETURNING id`,
        { replacements: { c: cohortId, p: studentId, d: fromDate }, type: QueryTypes.SELECT, transaction: sp },
      );
      return row!;
    });
  } catch (e) {
    if ((e as { parent?: { code?: string } }).parent?.code === "23P01")
      throw new HttpError(400, `${field}: the student already belongs to a cohort from that date`, field);
    throw e;
  }
}

/** Adds a student to a cohort from a date (a student without a cohort on that date and after). */
export async function addMember(user: CurrentUser, input: AddMemberOutput, t: Transaction) {
  requireCohortManager(user);
  const c = await openCohort(user, input.cohortId, "cohortId", input.fromDate, t);
  if (input.fromDate < c.startsOn)
    throw new HttpError(400, `fromDate: must not be before the cohort starts (${formatDay(c.startsOn)})`, "fromDate");
  await requireStudent(user, input.studentId, t);
  return insertMembership(c.id, input.studentId, input.fromDate, "fromDate", t);
}

/**
 * Moves a student to another cohort from a date: the membership running on that date ends then,
 * and the new one starts. A date before that membership began, or one that meets a later
 * membership, is a 400 naming onDate; nothing is written.
 */
export async function moveMember(user: CurrentUser, input: MoveMemberOutput, t: Transaction) {
  requireCohortManager(user);
  await requireStudent(user, input.studentId, t);
  const target = await openCohort(user, input.toCohortId, "toCohortId", input.onDate, t);
  if (input.onDate < target.startsOn)
    throw new HttpError(400, `onDate: must not be before ${target.name} starts (${formatDay(target.startsOn)})`, "onDate");
  const [current] = await sequelize.query<{ id: string; cohortId: string; fromDate: string }>(
    `SELECT m.id, m.cohort_id AS "cohortId", m.from_date::text AS "fromDate" FROM cohort_memberships m JOIN cohorts c ON c.id = m.cohort_id
      WHERE m.student_id = :p AND c.school_id = :s AND m.from_date <= :d AND (m.to_date IS NULL OR m.to_date > :d) FOR UPDATE OF m`,
    { replacements: { p: input.studentId, s: user.schoolId, d: input.onDate }, type: QueryTypes.SELECT, transaction: t },
  );
  if (current?.cohortId === input.toCohortId)
    throw new HttpError(409, "toCohortId: the student is already in this cohort then", "toCohortId");
  if (current && current.fromDate === input.onDate)
    throw new HttpError(400, `onDate: must be after the current membership began (${formatDay(current.fromDate)})`, "onDate");
  return sequelize.transaction({ transaction: t }, async (sp) => {
    if (current) {
      await sequelize.query(`UPDATE cohort_memberships SET to_date = :d WHERE id = :id`, {
        replacements: { d: input.onDate, id: current.id },
        transaction: sp,
      });
    }
    return insertMembership(input.toCohortId, input.studentId, input.onDate, "onDate", sp);
  });
}
