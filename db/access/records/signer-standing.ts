import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { addMonths, format, parseISO } from "date-fns";
import { formatDay } from "@/lib/time";
import { sequelize } from "../../index";
import { RecordRefusal } from "./refusals";

// The signer's standing on the day of an act (sign-off, oral check, stage check), read from the
// instructor file's versions in force on that date, and the refusal when it does not hold.

/**
 * Whether the signer held the course and was current on `onDate` (recency in calendar months),
 * judged against the qualification versions and course grants in force on that date (migration 0520).
 */
export async function signerStanding(
  personId: string,
  courseId: string,
  onDate: string,
  t?: Transaction,
): Promise<{ qualified: boolean; current: boolean; currentUntil: string | null }> {
  const inForce = `valid_from <= CAST(:d AS date) AND (valid_to IS NULL OR CAST(:d AS date) < valid_to)`;
  const [course] = await sequelize.query<{ ok: boolean }>(
    `SELECT EXISTS (SELECT 1 FROM instructor_courses WHERE person_id = :p AND course_id = :c AND ${inForce}) AS ok`,
    { replacements: { p: personId, c: courseId, d: onDate }, type: QueryTypes.SELECT, transaction: t },
  );
  const quals = await sequelize.query<{ issued_on: string; recency_on: string; recency_months: number }>(
    `SELECT issued_on, recency_on, recency_months FROM instructor_qualifications WHERE person_id = :p AND ${inForce}`,
    { replacements: { p: personId, d: onDate }, type: QueryTypes.SELECT, transaction: t },
  );
  let currentUntil: string | null = null;
  let current = false;
  for (const q of quals) {
    const until = format(addMonths(parseISO(q.recency_on), q.recency_months), "yyyy-MM-dd");
    if (!currentUntil || until > currentUntil) currentUntil = until;
    if (q.issued_on <= onDate && onDate < until) current = true;
  }
  return { qualified: !!course?.ok && quals.length > 0, current, currentUntil };
}

/**
 * Refuses an act on `onDate` when the person was not qualified for the student's course or their
 * recency had lapsed, naming the reason (`signer_not_qualified`, `signer_not_current`).
 */
export async function refuseUnlessStanding(
  personId: string,
  student: { courseId: string; courseCode: string },
  onDate: string,
  act: string,
  t?: Transaction,
): Promise<void> {
  const standing = await signerStanding(personId, student.courseId, onDate, t);
  if (!standing.qualified)
    throw new RecordRefusal(
      "signer_not_qualified",
      `signer: you are not qualified to ${act} of ${student.courseCode} on ${formatDay(onDate)}`,
      "signer",
    );
  if (!standing.current)
    throw new RecordRefusal(
      "signer_not_current",
      `signer: your instructor recency is not current on ${formatDay(onDate)}${standing.currentUntil ? ` (it ran until ${formatDay(standing.currentUntil)})` : ""}; ` +
        `you may ${act} again once the chief instructor records its renewal in your instructor file`,
      "signer",
    );
}
