import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { HttpError } from "@/lib/http/errors";
import { formatDay } from "@/lib/time";
import { can } from "@/lib/auth/can";
import type { CurrentUser } from "@/lib/auth/session";
import type { CloseCohortOutput, CreateCohortOutput, RenameCohortOutput } from "@/lib/cohorts/schema";

// The chief creates, renames and closes cohorts (memberships: dated-membership.ts).

export function requireCohortManager(user: CurrentUser) {
  if (!can(user, "cohorts.manage")) throw new HttpError(403, "You may not manage cohorts");
}

/** A refusal of the database inside a savepoint, as a 4xx naming the field; anything else is rethrown. */
export async function guardCohortWrite<T>(t: Transaction, fn: (sp: Transaction) => Promise<T>, name?: string): Promise<T> {
  try {
    return await sequelize.transaction({ transaction: t }, fn);
  } catch (e) {
    const pe = (e as { parent?: { code?: string; constraint?: string } }).parent;
    if (pe?.code === "23505" && name !== undefined)
      throw new HttpError(409, `name: the school already has a cohort called ${name}`, "name");
    throw e;
  }
}

export async function createCohort(user: CurrentUser, input: CreateCohortOutput, t: Transaction) {
  requireCohortManager(user);
  const [course] = await sequelize.query<{ id: string }>(`SELECT id FROM courses WHERE id = :c AND school_id = :s`, {
    replacements: { c: input.courseId, s: user.schoolId },
    type: QueryTypes.SELECT,
    transaction: t,
  });
  if (!course) throw new HttpError(400, "courseId: no such course at this school", "courseId");
  const [lead] = await sequelize.query<{ id: string }>(
    `SELECT id FROM people WHERE id = :p AND school_id = :s AND active AND 'instructor' = ANY(roles)`,
    { replacements: { p: input.leadInstructorId, s: user.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!lead) throw new HttpError(400, "leadInstructorId: not an instructor of this school", "leadInstructorId");
  return guardCohortWrite(
    t,
    async (sp) => {
      const [row] = await sequelize.query<{ id: string; name: string }>(
        `INSERT INTO cohorts (school_id, course_id, name, lead_instructor_id, starts_on) VALUES (:s, :c, :n, :l, :d) RETURNING id, name`,
        {
          replacements: { s: user.schoolId, c: input.courseId, n: input.name, l: input.leadInstructorId, d: input.startsOn },
          type: QueryTypes.SELECT,
          transaction: sp,
        },
      );
      return row!;
    },
    input.name,
  );
}

export async function renameCohort(user: CurrentUser, input: RenameCohortOutput, t: Transaction) {
  requireCohortManager(user);
  return guardCohortWrite(
    t,
    async (sp) => {
      const [row] = await sequelize.query<{ id: string; name: string }>(
        `UPDATE cohorts SET name = :n WHERE id = :id AND school_id = :s RETURNING id, name`,
        { replacements: { id: input.cohortId, s: user.schoolId, n: input.name }, type: QueryTypes.SELECT, transaction: sp },
      );
      if (!row) throw new HttpError(404, "cohortId: no such cohort at this school", "cohortId");
      return row;
    },
    input.name,
  );
}

/** Closes a cohort from a date; refused (409 naming closedOn) while anyone still belongs to it on or after that date. */
export async function closeCohort(user: CurrentUser, input: CloseCohortOutput, t: Transaction) {
  requireCohortManager(user);
  const [c] = await sequelize.query<{ id: string; startsOn: string; closedOn: string | null }>(
    `SELECT id, starts_on::text AS "startsOn", closed_on::text AS "closedOn" FROM cohorts WHERE id = :id AND school_id = :s FOR UPDATE`,
    { replacements: { id: input.cohortId, s: user.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!c) throw new HttpError(404, "cohortId: no such cohort at this school", "cohortId");
  if (c.closedOn) throw new HttpError(409, `closedOn: the cohort is already closed from ${formatDay(c.closedOn)}`, "closedOn");
  if (input.closedOn < c.startsOn)
    throw new HttpError(400, `closedOn: must not be before the cohort starts (${formatDay(c.startsOn)})`, "closedOn");
  const [left] = await sequelize.query<{ n: number }>(
    `SELECT count(*)::int AS n FROM cohort_memberships WHERE cohort_id = :id AND (to_date IS NULL OR to_date > :d)`,
    { replacements: { id: c.id, d: input.closedOn }, type: QueryTypes.SELECT, transaction: t },
  );
  if (left!.n > 0)
    throw new HttpError(
      409,
      `closedOn: ${left!.n} student${left!.n === 1 ? " still belongs" : "s still belong"} to the cohort on that date; move them first`,
      "closedOn",
    );
  await sequelize.query(`UPDATE cohorts SET closed_on = :d WHERE id = :id`, {
    replacements: { id: c.id, d: input.closedOn },
    transaction: t,
  });
  return { id: c.id, closedOn: input.closedOn };
}
