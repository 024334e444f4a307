import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { z } from "zod";
import { addStudentSchema, moveStudentSchema } from "@/lib/timetable/schemas";
import { sequelize } from "../index";
import { createPerson } from "./people";
import { addToCohort, enrol, linkSponsor, moveStudentToCohort } from "./cohorts";
import { schoolInTx } from "./sessions";
import { enqueueMail } from "./outbox";
import { createSetPasswordLink } from "./set-password";
import { composeMail } from "@/lib/mail/compose";
import { parseCsv } from "@/lib/csv";
import { dateInZone } from "@/lib/time";
import { now } from "@/lib/clock";
import { HttpError } from "@/lib/http/errors";
import type { CurrentUser } from "@/lib/auth/session";

/** Largest roster upload accepted, in bytes (a few thousand rows). */
export const ROSTER_MAX_BYTES = 256 * 1024;
export const ROSTER_MAX_ROWS = 2000;

const email = z.string().trim().toLowerCase().email();

export { addStudentSchema, moveStudentSchema };
export type AddStudentInput = z.output<typeof addStudentSchema>;

export interface RosterCohort {
  id: string;
  name: string;
  courseId: string;
  leadInstructorId: string;
}

/** Cohorts the caller may add students to: the chief, every cohort; an instructor, those they lead. */
export async function cohortsManagedBy(user: CurrentUser, t?: Transaction): Promise<RosterCohort[]> {
  const all = user.roles.includes("chief");
  return sequelize.query<RosterCohort>(
    `SELECT id, name, course_id AS "courseId", lead_instructor_id AS "leadInstructorId" FROM cohorts
      WHERE school_id = :schoolId AND (:all OR lead_instructor_id = :uid) ORDER BY starts_on, name`,
    { replacements: { schoolId: user.schoolId, all, uid: user.id }, type: QueryTypes.SELECT, transaction: t },
  );
}

// ---------------------------------------------------------------- CSV import

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

export interface RosterRowInput {
  name: string;
  email: string;
  cohort: string;
  sponsorName: string;
  sponsorEmail: string;
}

export interface RosterPreviewRow extends RosterRowInput {
  /** line in the file (the header is line 1) */
  line: number;
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

/** Reads a roster file into rows; unknown columns are ignored, known ones matched by several spellings. */
export function readRosterCsv(text: string | Buffer): {
  delimiter: "," | ";";
  rows: (RosterRowInput & { line: number })[];
  fileProblems: string[];
} {
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
    const out: RosterRowInput & { line: number } = { line: i + 2, name: "", email: "", cohort: "", sponsorName: "", sponsorEmail: "" };
    parsed.header.forEach((h, j) => {
      const key = columns[j];
      if (key) out[key] = (r[h] ?? "").trim();
    });
    return out;
  });
  return { delimiter: parsed.delimiter, rows, fileProblems };
}

/**
 * Checks every row without writing anything: missing fields, bad e-mail, duplicate in the file,
 * an e-mail that already belongs to an account, a cohort the caller may not add to.
 */
export async function previewRosterImport(user: CurrentUser, text: string | Buffer, t?: Transaction): Promise<RosterPreview> {
  const { delimiter, rows, fileProblems } = readRosterCsv(text);
  const cohorts = await cohortsManagedBy(user, t);
  const byName = new Map(cohorts.map((c) => [c.name.trim().toLowerCase(), c]));
  const emails = rows.map((r) => r.email.toLowerCase()).filter(Boolean);
  const sponsorEmails = rows.map((r) => r.sponsorEmail.toLowerCase()).filter(Boolean);
  const existing = await existingAccounts(user.schoolId, [...emails, ...sponsorEmails], t);
  const seen = new Map<string, number>();
  const out: RosterPreviewRow[] = rows.map((r) => {
    const problems: string[] = [];
    if (!r.name) problems.push("name: missing");
    else if (r.name.length > 200) problems.push("name: longer than 200 characters");
    const mail = r.email.toLowerCase();
    if (!r.email) problems.push("e-mail: missing");
    else if (!email.safeParse(r.email).success) problems.push("e-mail: not a valid address");
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
      const c = byName.get(r.cohort.toLowerCase());
      if (c) cohortId = c.id;
      else problems.push(`cohort: no cohort named "${r.cohort}" that you may add to`);
    }
    if (r.sponsorEmail && !email.safeParse(r.sponsorEmail).success) problems.push("sponsor e-mail: not a valid address");
    else if (r.sponsorEmail && r.sponsorEmail.toLowerCase() === mail) problems.push("sponsor e-mail: the same as the student's");
    else if (r.sponsorEmail) {
      const acct = existing.get(r.sponsorEmail.toLowerCase());
      if (acct && (!acct.sameSchool || !acct.roles.includes("sponsor")))
        problems.push("sponsor e-mail: belongs to an account that is not a sponsor of this school");
    }
    if (r.sponsorEmail && !r.sponsorName && !existing.get(r.sponsorEmail.toLowerCase()))
      problems.push("sponsor name: missing (needed for a new sponsor)");
    if (r.sponsorName && !r.sponsorEmail) problems.push("sponsor e-mail: missing");
    return { ...r, cohortId, problems };
  });
  if (out.length === 0 && fileProblems.length === 0) fileProblems.push("file: no rows below the header");
  return { delimiter, rows: out, fileProblems, readyCount: out.filter((r) => r.problems.length === 0).length };
}

async function existingAccounts(schoolId: string, emails: string[], t?: Transaction) {
  const map = new Map<string, { id: string; sameSchool: boolean; roles: string[] }>();
  if (emails.length === 0) return map;
  const rows = await sequelize.query<{ id: string; email: string; schoolId: string; roles: string[] }>(
    `SELECT id, lower(email) AS email, school_id AS "schoolId", roles FROM people WHERE lower(email) = ANY(ARRAY[:emails]::text[])`,
    { replacements: { emails: [...new Set(emails)] }, type: QueryTypes.SELECT, transaction: t },
  );
  for (const r of rows) map.set(r.email, { id: r.id, sameSchool: r.schoolId === schoolId, roles: r.roles });
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
  // The checks that do not depend on other writers are repeated here; "already an account" is
  // left to the write itself, which is where a concurrent change shows up.
  const seen = new Set<string>();
  for (const r of rows) {
    const bad = !r.name
      ? "name: missing"
      : !email.safeParse(r.email).success
        ? "e-mail: not a valid address"
        : seen.has(r.email.toLowerCase())
          ? "e-mail: duplicate in this file"
          : !cohorts.get(r.cohort.toLowerCase())
            ? "cohort: not one you may add to"
            : r.sponsorEmail && !email.safeParse(r.sponsorEmail).success
              ? "sponsor e-mail: not a valid address"
              : null;
    if (bad) throw new HttpError(422, `line ${r.line}: ${bad}`, "file");
    seen.add(r.email.toLowerCase());
  }
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

// ---------------------------------------------------------------- one by one

/** The invitation to set a password, written to the outbox in the transaction that creates the account. */
async function sendInvitation(
  t: Transaction,
  p: { schoolId: string; personId: string; name: string; email: string; invitedBy: string; role: "student" | "sponsor" },
): Promise<void> {
  const school = await schoolInTx(p.schoolId, t);
  const link = await createSetPasswordLink(t, p.personId);
  const mail = composeMail("invitation", { name: p.name, setPasswordUrl: link.url, expiresAt: link.expiresAt }, school);
  await enqueueMail(t, {
    schoolId: p.schoolId,
    kind: "invitation",
    idempotencyKey: `invitation:${p.personId}:1`,
    recipientId: p.personId,
    to: p.email,
    ...mail,
  });
}

/**
 * Adds one student: the account (no password; an invitation to set one goes through the outbox),
 * membership of the cohort from today, enrolment on the cohort's course at its latest syllabus
 * revision, and optionally a sponsor (an existing sponsor account is linked, a new one is invited).
 */
export async function addStudentTx(
  user: CurrentUser,
  input: AddStudentInput,
  t: Transaction,
): Promise<{ studentId: string; sponsorId: string | null; invitations: number }> {
  const cohort = (await cohortsManagedBy(user, t)).find((c) => c.id === input.cohortId);
  if (!cohort) throw new HttpError(404, "cohortId: no such cohort that you may add to", "cohortId");
  const school = await schoolInTx(user.schoolId, t);
  const today = dateInZone(now(), school.timeZone);
  // createPerson checks first; the unique index on lower(email) catches a writer that slipped in between
  const taken = (e: unknown, field: "email" | "sponsorEmail") => {
    const code = (e as { parent?: { code?: string } })?.parent?.code;
    if (e instanceof HttpError || code === "23505")
      throw new HttpError(409, `${field === "email" ? "e-mail" : "sponsor e-mail"}: already belongs to an account`, field);
    throw e;
  };
  const student = await createPerson({ schoolId: user.schoolId, name: input.name, email: input.email, roles: ["student"] }, t).catch((e) =>
    taken(e, "email"),
  );
  await addToCohort({ cohortId: cohort.id, studentId: student.id, fromDate: today }, t);
  const [rev] = await sequelize.query<{ id: string }>(
    `SELECT id FROM syllabus_revisions WHERE course_id = :c ORDER BY number DESC LIMIT 1`,
    { replacements: { c: cohort.courseId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (rev) await enrol({ studentId: student.id, courseId: cohort.courseId, revisionId: rev.id, enrolledOn: today }, t);
  let invitations = 0;
  await sendInvitation(t, {
    schoolId: user.schoolId,
    personId: student.id,
    name: student.name,
    email: student.email,
    invitedBy: user.name,
    role: "student",
  });
  invitations++;
  let sponsorId: string | null = null;
  if (input.sponsorEmail) {
    const [found] = await sequelize.query<{ id: string; schoolId: string; roles: string[] }>(
      `SELECT id, school_id AS "schoolId", roles FROM people WHERE lower(email) = :e`,
      { replacements: { e: input.sponsorEmail.toLowerCase() }, type: QueryTypes.SELECT, transaction: t },
    );
    if (found) {
      if (found.schoolId !== user.schoolId || !found.roles.includes("sponsor")) {
        throw new HttpError(409, "sponsor e-mail: belongs to an account that is not a sponsor of this school", "sponsorEmail");
      }
      sponsorId = found.id;
    } else {
      const sponsor = await createPerson(
        { schoolId: user.schoolId, name: input.sponsorName || input.sponsorEmail, email: input.sponsorEmail, roles: ["sponsor"] },
        t,
      ).catch((e) => taken(e, "sponsorEmail"));
      sponsorId = sponsor.id;
      await sendInvitation(t, {
        schoolId: user.schoolId,
        personId: sponsor.id,
        name: sponsor.name,
        email: sponsor.email,
        invitedBy: user.name,
        role: "sponsor",
      });
      invitations++;
    }
    await linkSponsor({ sponsorId, studentId: student.id }, t);
  }
  return { studentId: student.id, sponsorId, invitations };
}

/** Moves a student to another cohort from a date; the old membership is kept with its end date. */
export async function moveStudent(user: CurrentUser, input: z.output<typeof moveStudentSchema>, t: Transaction) {
  // the target may be any cohort of the school (the student moves to another lead); the caller must lead the current one
  const [target] = await sequelize.query<{ id: string }>(`SELECT id FROM cohorts WHERE id = :c AND school_id = :s`, {
    replacements: { c: input.toCohortId, s: user.schoolId },
    type: QueryTypes.SELECT,
    transaction: t,
  });
  if (!target) throw new HttpError(404, "toCohortId: no such cohort", "toCohortId");
  const [current] = await sequelize.query<{ cohortId: string; fromDate: string; leadInstructorId: string; schoolId: string }>(
    `SELECT m.cohort_id AS "cohortId", m.from_date AS "fromDate", c.lead_instructor_id AS "leadInstructorId", c.school_id AS "schoolId"
       FROM cohort_memberships m JOIN cohorts c ON c.id = m.cohort_id
      WHERE m.student_id = :s AND m.to_date IS NULL`,
    { replacements: { s: input.studentId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!current || current.schoolId !== user.schoolId) throw new HttpError(404, "studentId: no such student in a cohort", "studentId");
  if (!user.roles.includes("chief") && current.leadInstructorId !== user.id) {
    throw new HttpError(403, "studentId: only the student's lead instructor or the chief instructor may move them", "studentId");
  }
  if (current.cohortId === input.toCohortId) throw new HttpError(409, "toCohortId: the student is already in this cohort", "toCohortId");
  if (input.onDate <= current.fromDate)
    throw new HttpError(400, `onDate: must be after the current membership began (${current.fromDate})`, "onDate");
  return moveStudentToCohort(
    { schoolId: user.schoolId, studentId: input.studentId, toCohortId: input.toCohortId, onDate: input.onDate },
    t,
  );
}

export interface RosterStudent {
  studentId: string;
  name: string;
  email: string;
  cohortId: string;
  cohortName: string;
  fromDate: string;
  toDate: string | null;
  /** every membership of this student, oldest first */
  history: { cohortName: string; fromDate: string; toDate: string | null }[];
  sponsors: string[];
}

/**
 * The students of the cohorts the caller leads (the chief: every cohort), each with the whole
 * membership history, so a new lead instructor sees where the student came from.
 */
export async function listRoster(user: CurrentUser): Promise<RosterStudent[]> {
  const all = user.roles.includes("chief");
  const today = dateInZone(now(), (await schoolInTx(user.schoolId)).timeZone);
  return sequelize.query<RosterStudent>(
    `SELECT p.id AS "studentId", p.name, p.email, c.id AS "cohortId", c.name AS "cohortName", m.from_date AS "fromDate", m.to_date AS "toDate",
            (SELECT json_agg(json_build_object('cohortName', hc.name, 'fromDate', hm.from_date, 'toDate', hm.to_date) ORDER BY hm.from_date)
               FROM cohort_memberships hm JOIN cohorts hc ON hc.id = hm.cohort_id WHERE hm.student_id = p.id) AS history,
            COALESCE((SELECT array_agg(sp.name ORDER BY sp.name) FROM sponsor_links l JOIN people sp ON sp.id = l.sponsor_id WHERE l.student_id = p.id), '{}') AS sponsors
       FROM cohort_memberships m
       JOIN cohorts c ON c.id = m.cohort_id
       JOIN people p ON p.id = m.student_id
      WHERE c.school_id = :schoolId AND m.from_date <= :today AND (m.to_date IS NULL OR m.to_date > :today) AND (:all OR c.lead_instructor_id = :uid)
      ORDER BY c.starts_on, c.name, p.name`,
    { replacements: { schoolId: user.schoolId, all, uid: user.id, today }, type: QueryTypes.SELECT },
  );
}
