import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { can } from "@/lib/auth/can";
import { HttpError } from "@/lib/http/errors";
import { now } from "@/lib/clock";
import { dateInZone, formatDay } from "@/lib/time";
import type { WithdrawFromCohortInput } from "@/lib/completion/schema";
import { getSchool } from "../shared/school";
import { writeAudit } from "../records/audit-chain";

// Withdrawing a student from their cohort: the membership running on the date ends then, with the
// reason kept on it (migration 0620) and in the audit chain. The enrolment on the course goes on
// (a student may join a later cohort); ending the course itself is the end of training
// (end-training.ts), which also ends the membership (closeMembershipsAtEnd below).

export interface WithdrawFromCohortResult {
  membershipId: string;
  cohortName: string;
  leftOn: string;
}

export async function withdrawFromCohort(
  t: Transaction,
  user: CurrentUser,
  input: WithdrawFromCohortInput,
): Promise<WithdrawFromCohortResult> {
  if (!can(user, "cohorts.manage")) throw new HttpError(403, "You may not change cohort memberships");
  const school = await getSchool(user.schoolId, t);
  const today = dateInZone(now(), school.timeZone);
  if (input.leftOn > today) throw new HttpError(400, "leftOn: cannot be later than today", "leftOn");
  const [m] = await sequelize.query<{ id: string; fromDate: string; toDate: string | null; cohortName: string; studentName: string }>(
    `SELECT m.id, m.from_date::text AS "fromDate", m.to_date::text AS "toDate", c.name AS "cohortName", p.name AS "studentName"
       FROM cohort_memberships m JOIN cohorts c ON c.id = m.cohort_id JOIN people p ON p.id = m.student_id
      WHERE m.student_id = :p AND c.school_id = :s AND p.school_id = :s
        AND m.from_date <= :d AND (m.to_date IS NULL OR m.to_date > :d)
      FOR UPDATE OF m`,
    { replacements: { p: input.studentId, s: user.schoolId, d: input.leftOn }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!m) throw new HttpError(409, "leftOn: the student belongs to no cohort on that date", "leftOn");
  if (m.fromDate === input.leftOn)
    throw new HttpError(400, `leftOn: must be after the membership began (${formatDay(m.fromDate)})`, "leftOn");
  await sequelize.query(`UPDATE cohort_memberships SET to_date = :d, end_reason = :r WHERE id = :id`, {
    replacements: { d: input.leftOn, r: input.reason, id: m.id },
    transaction: t,
  });
  await writeAudit(t, {
    schoolId: user.schoolId,
    actor: user,
    action: "cohort.withdrawn",
    recordType: "cohort_membership",
    recordId: m.id,
    before: { fromDate: m.fromDate, toDate: m.toDate },
    after: { studentId: input.studentId, fromDate: m.fromDate, toDate: input.leftOn, reason: input.reason },
  });
  return { membershipId: m.id, cohortName: m.cohortName, leftOn: input.leftOn };
}

/**
 * At the end of training the student leaves their cohort on the same date, with the same reason,
 * so they drop off its roster, its timetable and its Weekly letters. Memberships that would start
 * after that date end where they start (they never run).
 */
export async function closeMembershipsAtEnd(
  t: Transaction,
  schoolId: string,
  studentId: string,
  endedOn: string,
  reason: string,
): Promise<number> {
  const rows = await sequelize.query<{ id: string }>(
    `UPDATE cohort_memberships m SET to_date = GREATEST(m.from_date, :d), end_reason = :r
       FROM cohorts c
      WHERE c.id = m.cohort_id AND c.school_id = :s AND m.student_id = :p AND (m.to_date IS NULL OR m.to_date > :d)
      RETURNING m.id`,
    { replacements: { d: endedOn, r: reason, s: schoolId, p: studentId }, type: QueryTypes.SELECT, transaction: t },
  );
  return rows.length;
}
