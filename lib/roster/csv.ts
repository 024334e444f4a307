import { z } from "zod";
import { parseCsv } from "@/lib/csv";

// Reading and checking a roster file: pure, no I/O. The data layer looks up accounts and cohorts
// and hands them in; the rules of what makes a row importable live here.

/** Largest roster upload accepted, in bytes (a few thousand rows). */
export const ROSTER_MAX_BYTES = 256 * 1024;
export const ROSTER_MAX_ROWS = 2000;

const email = z.string().trim().toLowerCase().email();
export const isEmail = (s: string) => email.safeParse(s).success;

export interface RosterRowInput {
  name: string;
  email: string;
  cohort: string;
  sponsorName: string;
  sponsorEmail: string;
}

export type RosterFileRow = RosterRowInput & {
  /** line in the file (the header is line 1) */
  line: number;
};

export interface RosterPreviewRow extends RosterFileRow {
  cohortId: string | null;
  problems: string[];
}

export interface RosterPreview {
  delimiter: "," | ";";
  rows: RosterPreviewRow[];
  /** problems with the file as a whole (missing columns, too many rows) */
  fileProblems: string[];
  readyCount: number;
}

const HEADER_ALIASES: Record<string, keyof RosterRowInput> = {
  name: "name",
  "full name": "name",
  "student name": "name",
  email: "email",
  "e-mail": "email",
  "student email": "email",
  "student e-mail": "email",
  cohort: "cohort",
  "sponsor name": "sponsorName",
  sponsor_name: "sponsorName",
  sponsor: "sponsorName",
  "sponsor email": "sponsorEmail",
  "sponsor e-mail": "sponsorEmail",
  sponsor_email: "sponsorEmail",
};

/** Reads a roster file into rows; unknown columns are ignored, known ones matched by several spellings. */
export function readRosterCsv(text: string | Buffer): { delimiter: "," | ";"; rows: RosterFileRow[]; fileProblems: string[] } {
  let parsed;
  try {
    parsed = parseCsv(text);
  } catch (e) {
    return { delimiter: ",", rows: [], fileProblems: [`file: not readable as CSV (${(e as Error).message.split("\n")[0]})`] };
  }
  const columns = parsed.header.map((h) => HEADER_ALIASES[h.replace(/\s+/g, " ").trim()]);
  const fileProblems: string[] = [];
  for (const need of ["name", "email", "cohort"] as const) {
    if (!columns.includes(need)) fileProblems.push(`file: the header has no "${need === "email" ? "e-mail" : need}" column`);
  }
  if (parsed.rows.length > ROSTER_MAX_ROWS) fileProblems.push(`file: more than ${ROSTER_MAX_ROWS} rows`);
  const rows = parsed.rows.map((r, i) => {
    const out: RosterFileRow = { line: i + 2, name: "", email: "", cohort: "", sponsorName: "", sponsorEmail: "" };
    parsed.header.forEach((h, j) => {
      const key = columns[j];
      if (key) out[key] = (r[h] ?? "").trim();
    });
    return out;
  });
  return { delimiter: parsed.delimiter, rows, fileProblems };
}

/** An account that already holds an e-mail address (lower-cased key). */
export interface ExistingAccount {
  id: string;
  sameSchool: boolean;
  /** the account is a sponsor (may be linked to more students) */
  isSponsor: boolean;
}

/**
 * Checks every row of a file: missing fields, bad e-mail, duplicate in the file, an e-mail that
 * already belongs to an account, a cohort the caller may not add to, an unusable sponsor.
 * `cohortIdByName` holds the cohorts the caller may add to (names trimmed and lower-cased).
 */
export function checkRosterRows(
  rows: RosterFileRow[],
  cohortIdByName: ReadonlyMap<string, string>,
  existing: ReadonlyMap<string, ExistingAccount>,
): RosterPreviewRow[] {
  const seen = new Map<string, number>();
  return rows.map((r) => {
    const problems: string[] = [];
    if (!r.name) problems.push("name: missing");
    else if (r.name.length > 200) problems.push("name: longer than 200 characters");
    const mail = r.email.toLowerCase();
    if (!r.email) problems.push("e-mail: missing");
    else if (!isEmail(r.email)) problems.push("e-mail: not a valid address");
    else {
      const first = seen.get(mail);
      if (first !== undefined) problems.push(`e-mail: duplicate of line ${first} in this file`);
      else seen.set(mail, r.line);
      const acct = existing.get(mail);
      if (acct) problems.push(acct.sameSchool ? "e-mail: already an account" : "e-mail: already an account at another school");
    }
    let cohortId: string | null = null;
    if (!r.cohort) problems.push("cohort: missing");
    else {
      const c = cohortIdByName.get(r.cohort.toLowerCase());
      if (c) cohortId = c;
      else problems.push(`cohort: no cohort named "${r.cohort}" that you may add to`);
    }
    if (r.sponsorEmail && !isEmail(r.sponsorEmail)) problems.push("sponsor e-mail: not a valid address");
    else if (r.sponsorEmail && r.sponsorEmail.toLowerCase() === mail) problems.push("sponsor e-mail: the same as the student's");
    else if (r.sponsorEmail) {
      const acct = existing.get(r.sponsorEmail.toLowerCase());
      if (acct && (!acct.sameSchool || !acct.isSponsor))
        problems.push("sponsor e-mail: belongs to an account that is not a sponsor of this school");
    }
    if (r.sponsorEmail && !r.sponsorName && !existing.get(r.sponsorEmail.toLowerCase()))
      problems.push("sponsor name: missing (needed for a new sponsor)");
    if (r.sponsorName && !r.sponsorEmail) problems.push("sponsor e-mail: missing");
    return { ...r, cohortId, problems };
  });
}

/**
 * The first problem that stops a whole file from being written, as `line N: …`, or null. Only the
 * checks that do not depend on other writers; "already an account" is left to the write itself,
 * which is where a concurrent change shows up.
 */
export function firstBlockingProblem(rows: RosterFileRow[], cohortNames: ReadonlySet<string>): string | null {
  const seen = new Set<string>();
  for (const r of rows) {
    const bad = !r.name
      ? "name: missing"
      : !isEmail(r.email)
        ? "e-mail: not a valid address"
        : seen.has(r.email.toLowerCase())
          ? "e-mail: duplicate in this file"
          : !cohortNames.has(r.cohort.toLowerCase())
            ? "cohort: not one you may add to"
            : r.sponsorEmail && !isEmail(r.sponsorEmail)
              ? "sponsor e-mail: not a valid address"
              : null;
    if (bad) return `line ${r.line}: ${bad}`;
    seen.add(r.email.toLowerCase());
  }
  return null;
}
