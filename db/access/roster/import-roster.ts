import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { cohortsManagedBy } from "./managed-cohorts";
import { addStudentTx } from "./add-student";
import { HttpError } from "@/lib/http/errors";
import { checkRosterRows, firstBlockingProblem, readRosterCsv, type ExistingAccount, type RosterPreview } from "@/lib/roster/csv";
import type { CurrentUser } from "@/lib/auth/session";

/**
 * Checks every row without writing anything: missing fields, bad e-mail, duplicate in the file,
 * an e-mail that already belongs to an account, a cohort the caller may not add to.
 */
export async function previewRosterImport(user: CurrentUser, text: string | Buffer, t?: Transaction): Promise<RosterPreview> {
  const { delimiter, rows, fileProblems } = readRosterCsv(text);
  const cohorts = await cohortsManagedBy(user, t);
  const cohortIdByName = new Map(cohorts.map((c) => [c.name.trim().toLowerCase(), c.id]));
  const emails = rows.map((r) => r.email.toLowerCase()).filter(Boolean);
  const sponsorEmails = rows.map((r) => r.sponsorEmail.toLowerCase()).filter(Boolean);
  const existing = await existingAccounts(user.schoolId, [...emails, ...sponsorEmails], t);
  const out = checkRosterRows(rows, cohortIdByName, existing);
  if (out.length === 0 && fileProblems.length === 0) fileProblems.push("file: no rows below the header");
  return { delimiter, rows: out, fileProblems, readyCount: out.filter((r) => r.problems.length === 0).length };
}

async function existingAccounts(schoolId: string, emails: string[], t?: Transaction) {
  const map = new Map<string, ExistingAccount>();
  if (emails.length === 0) return map;
  const rows = await sequelize.query<{ id: string; email: string; schoolId: string; isSponsor: boolean }>(
    `SELECT id, lower(email) AS email, school_id AS "schoolId", 'sponsor' = ANY(roles) AS "isSponsor" FROM people WHERE lower(email) = ANY(ARRAY[:emails]::text[])`,
    { replacements: { emails: [...new Set(emails)] }, type: QueryTypes.SELECT, transaction: t },
  );
  for (const r of rows) map.set(r.email, { id: r.id, sameSchool: r.schoolId === schoolId, isSponsor: r.isSponsor });
  return map;
}

export interface RosterImportResult {
  created: number;
  invitations: number;
  sponsorsLinked: number;
}

/**
 * Writes the whole file in the caller's transaction: every row or none. Rows were checked by the
 * preview, but a row can still fail here (its e-mail taken meanwhile): the error names the line and
 * the transaction, with every person, membership and invitation already written, rolls back.
 */
export async function commitRosterImport(user: CurrentUser, text: string | Buffer, t: Transaction): Promise<RosterImportResult> {
  const { rows, fileProblems } = readRosterCsv(text);
  if (fileProblems.length) throw new HttpError(422, fileProblems[0]!, "file");
  const cohorts = new Map((await cohortsManagedBy(user, t)).map((c) => [c.name.trim().toLowerCase(), c]));
  const blocking = firstBlockingProblem(rows, new Set(cohorts.keys()));
  if (blocking) throw new HttpError(422, blocking, "file");
  const result: RosterImportResult = { created: 0, invitations: 0, sponsorsLinked: 0 };
  for (const r of rows) {
    const cohort = cohorts.get(r.cohort.toLowerCase())!;
    try {
      const added = await addStudentTx(
        user,
        { name: r.name, email: r.email, cohortId: cohort.id, sponsorName: r.sponsorName, sponsorEmail: r.sponsorEmail },
        t,
      );
      result.created += 1;
      result.invitations += added.invitations;
      if (added.sponsorId) result.sponsorsLinked += 1;
    } catch (e) {
      if (e instanceof HttpError) throw new HttpError(e.status, `line ${r.line}: ${e.message}`, "file");
      throw e;
    }
  }
  return result;
}

/** The whole import in its own transaction (for the upload route). */
export async function importRosterFile(user: CurrentUser, text: string | Buffer): Promise<RosterImportResult> {
  return sequelize.transaction((t) => commitRosterImport(user, text, t));
}
