import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { birthDateProblem, consentManager, type ConsentManager } from "@/lib/sharing/consent";
import type { BirthDateInput } from "@/lib/sharing/schema";
import { HttpError } from "@/lib/http/errors";
import { now } from "@/lib/clock";
import { dateInZone } from "@/lib/time";
import { accessTo } from "../shared/student-scope";
import { getSchool } from "../shared/school";
import { writeAudit } from "../records/audit-chain";

// Records (or clears) a student's date of birth. It decides who manages the student's sponsor
// links (under 18: the school; lib/sharing/consent.ts), so it takes effect at once on the Sharing
// pages and is audited (who, when, before, after) in the school's hash-chained trail. A date in
// the future or one giving an implausible age is a 400 naming birthDate; nothing is written.

export async function setBirthDate(
  caller: Pick<CurrentUser, "id" | "schoolId" | "roles">,
  input: BirthDateInput,
  t: Transaction,
): Promise<{ studentId: string; birthDate: string | null; manager: ConsentManager; changed: boolean }> {
  const notFound = new HttpError(404, "studentId: no such student", "studentId");
  if ((await accessTo(caller, input.studentId, "records", t)) !== "staff") throw notFound;
  const [row] = await sequelize.query<{ id: string; birth_date: string | null }>(
    `SELECT id, to_char(birth_date, 'YYYY-MM-DD') AS birth_date FROM people
      WHERE id = :id AND school_id = :school AND 'student' = ANY(roles) FOR UPDATE`,
    { replacements: { id: input.studentId, school: caller.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!row) throw notFound;
  const school = await getSchool(caller.schoolId, t);
  const today = dateInZone(now(), school.timeZone);
  const birthDate = input.birthDate === "" ? null : input.birthDate;
  if (birthDate) {
    const problem = birthDateProblem(birthDate, today);
    if (problem) throw new HttpError(400, `birthDate: ${problem}`, "birthDate");
  }
  const manager = consentManager(birthDate, today);
  if (row.birth_date === birthDate) return { studentId: row.id, birthDate, manager, changed: false };
  await sequelize.query(`UPDATE people SET birth_date = :birthDate WHERE id = :id`, {
    replacements: { birthDate, id: row.id },
    transaction: t,
  });
  await writeAudit(t, {
    schoolId: caller.schoolId,
    actor: caller,
    action: "person.birth_date",
    recordType: "person",
    recordId: row.id,
    before: { birth_date: row.birth_date },
    after: { birth_date: birthDate },
  });
  return { studentId: row.id, birthDate, manager, changed: true };
}
