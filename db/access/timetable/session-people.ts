import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { HttpError } from "@/lib/http/errors";
import { rolesWith } from "@/lib/auth/permissions";

/** Who may teach a session: people whose roles may record its attendance. */
export const TEACHING_ROLES = rolesWith("attendance.record");

export async function requireInstructor(schoolId: string, personId: string, t: Transaction) {
  const [p] = await sequelize.query<{ id: string; name: string }>(
    `SELECT id, name FROM people WHERE id = :id AND school_id = :s AND active AND roles && ARRAY[:teachers]::text[]`,
    { replacements: { id: personId, s: schoolId, teachers: TEACHING_ROLES }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!p) throw new HttpError(404, "instructorId: no such instructor at this school", "instructorId");
  return p;
}

/** The students a session takes: members of the cohort on the session's date, plus those named. */
export async function attendeesFor(schoolId: string, cohortId: string, studentIds: string[], onDate: string, t: Transaction) {
  const out = new Map<string, "cohort" | "individual">();
  if (cohortId) {
    const members = await sequelize.query<{ id: string }>(
      `SELECT m.student_id AS id FROM cohort_memberships m JOIN cohorts c ON c.id = m.cohort_id JOIN people p ON p.id = m.student_id
        WHERE c.id = :c AND c.school_id = :s AND p.active AND m.from_date <= :d AND (m.to_date IS NULL OR m.to_date > :d)`,
      { replacements: { c: cohortId, s: schoolId, d: onDate }, type: QueryTypes.SELECT, transaction: t },
    );
    for (const m of members) out.set(m.id, "cohort");
  }
  if (studentIds.length) {
    const found = await sequelize.query<{ id: string }>(
      `SELECT id FROM people WHERE id = ANY(ARRAY[:ids]::uuid[]) AND school_id = :s AND active AND 'student' = ANY(roles)`,
      { replacements: { ids: studentIds, s: schoolId }, type: QueryTypes.SELECT, transaction: t },
    );
    if (found.length !== new Set(studentIds).size)
      throw new HttpError(404, "studentIds: a chosen student is not a student of this school", "studentIds");
    for (const f of found) if (!out.has(f.id)) out.set(f.id, "individual");
  }
  return out;
}

/** The active attendees of a session, to be told of a change. */
export async function attendeesToTell(sessionId: string, t: Transaction) {
  return sequelize.query<{ id: string; name: string; email: string }>(
    `SELECT p.id, p.name, p.email FROM session_attendees a JOIN people p ON p.id = a.student_id WHERE a.session_id = :id AND p.active ORDER BY p.name`,
    { replacements: { id: sessionId }, type: QueryTypes.SELECT, transaction: t },
  );
}
