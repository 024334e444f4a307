import "server-only";
import { createHash } from "node:crypto";
import { QueryTypes, type Transaction } from "sequelize";
import { addDays, addMonths, format, parseISO } from "date-fns";
import { sequelize } from "../index";
import type { CurrentUser } from "@/lib/auth/session";
import { verifyPassword } from "@/lib/auth/password";
import { HttpError } from "@/lib/http/errors";
import { now } from "@/lib/clock";
import { dateInZone } from "@/lib/time";
import { composeMail } from "@/lib/mail/compose";
import { LEVEL_LABEL, levelReaches, type ItemOutcome, type LevelOfLearning } from "@/lib/records/outcome";
import { writeAudit } from "./audit";
import { enqueueMail } from "./outbox";
import {
  requireStudentFor,
  itemsOfRevision,
  assertStageOpen,
  openMakeupItemIds,
  RecordRefusal,
  type ItemRef,
  type StudentRef,
  schoolFor,
} from "./records";

export interface SignOffInput {
  studentId: string;
  itemId: string;
  basisCheckId?: string | undefined;
  /** the date the sign-off is for (school calendar); default today */
  signedOn?: string | undefined;
  password: string;
}

interface BasisCheck {
  id: string;
  occurredAt: Date;
  levelShown: LevelOfLearning;
  itemOutcomes: ItemOutcome[];
  instructorName: string;
  withdrawn: boolean;
  superseded: boolean;
}

export interface SignOffPlan {
  student: StudentRef;
  item: ItemRef;
  basis: BasisCheck;
  signedOn: string;
  statement: string;
  signerName: string;
}

/** Whether the signer holds the course and is current on `onDate` (recency in calendar months). */
export async function signerStanding(
  personId: string,
  courseId: string,
  onDate: string,
  t?: Transaction,
): Promise<{ qualified: boolean; current: boolean; currentUntil: string | null }> {
  const [course] = await sequelize.query<{ ok: boolean }>(
    `SELECT EXISTS (SELECT 1 FROM instructor_courses WHERE person_id = :p AND course_id = :c) AS ok`,
    { replacements: { p: personId, c: courseId }, type: QueryTypes.SELECT, transaction: t },
  );
  const quals = await sequelize.query<{ issued_on: string; recency_on: string; recency_months: number }>(
    `SELECT issued_on, recency_on, recency_months FROM instructor_qualifications WHERE person_id = :p`,
    { replacements: { p: personId }, type: QueryTypes.SELECT, transaction: t },
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

async function checksCovering(studentId: string, itemId: string, t?: Transaction): Promise<BasisCheck[]> {
  return sequelize.query<BasisCheck>(
    `SELECT c.id, c.occurred_at AS "occurredAt", c.level_shown AS "levelShown", c.item_outcomes AS "itemOutcomes", p.name AS "instructorName",
            EXISTS (SELECT 1 FROM oral_check_withdrawals w WHERE w.check_id = c.id) AS withdrawn,
            EXISTS (SELECT 1 FROM oral_checks a WHERE a.amends_id = c.id) AS superseded
       FROM oral_checks c JOIN oral_check_items ci ON ci.check_id = c.id JOIN people p ON p.id = c.instructor_id
      WHERE c.student_id = :studentId AND ci.syllabus_item_id = :itemId
      ORDER BY c.occurred_at DESC, c.recorded_at DESC`,
    { replacements: { studentId, itemId }, type: QueryTypes.SELECT, transaction: t },
  );
}

function statementText(p: {
  signerName: string;
  studentName: string;
  item: ItemRef;
  basis: BasisCheck;
  signedOn: string;
  timeZone: string;
}): string {
  return (
    `I, ${p.signerName}, certify that ${p.studentName} has met the completion standard of syllabus item ${p.item.code} "${p.item.title}" ` +
    `at the level of ${LEVEL_LABEL[p.item.requiredLevel].toLowerCase()} or above, on the basis of the oral check of ${dateInZone(p.basis.occurredAt, p.timeZone)} ` +
    `recorded by ${p.basis.instructorName}. Signed for ${p.signedOn}.`
  );
}

/**
 * Everything that must hold before a sign-off, in order; throws a RecordRefusal naming the
 * reason. Used by the signing form (to show the statement) and by the signing itself.
 */
export async function planSignOff(user: CurrentUser, input: Omit<SignOffInput, "password">, t?: Transaction): Promise<SignOffPlan> {
  const { student } = await requireStudentFor(user, input.studentId, "staff", t);
  const all = await itemsOfRevision(student.revisionId, t);
  const item = all.find((i) => i.id === input.itemId);
  if (!item) throw new HttpError(400, "itemId: not an item of the student's syllabus revision", "itemId");
  const school = await schoolFor(user.schoolId, t);
  const today = dateInZone(now(), school.timeZone);
  const signedOn = input.signedOn ?? today;
  if (signedOn > today) throw new HttpError(400, "signedOn: cannot be in the future", "signedOn");

  const standing = await signerStanding(user.id, student.courseId, signedOn, t);
  if (!standing.qualified)
    throw new RecordRefusal("signer_not_qualified", `signer: you are not qualified to sign off items of ${student.courseCode}`, "signer");
  if (!standing.current)
    throw new RecordRefusal(
      "signer_not_current",
      `signer: your instructor recency is not current on ${signedOn}${standing.currentUntil ? ` (it ran until ${standing.currentUntil})` : ""}`,
      "signer",
    );
  await assertStageOpen(student, [item], all, "itemId", t);
  if ((await openMakeupItemIds(student.id, t)).has(item.id))
    throw new RecordRefusal("makeup_open", `itemId: ${item.code} has an open make-up item; close it before signing off`, "itemId");

  const candidates = (await checksCovering(student.id, item.id, t)).filter((c) => !c.superseded);
  let basis: BasisCheck | undefined;
  if (input.basisCheckId) {
    basis = candidates.find((c) => c.id === input.basisCheckId);
    if (!basis)
      throw new RecordRefusal(
        "no_check",
        `basisCheckId: that check does not cover ${item.code} for this student, or was amended`,
        "basisCheckId",
      );
  } else {
    const inForce = candidates.filter((c) => !c.withdrawn);
    if (candidates.length === 0) throw new RecordRefusal("no_check", `itemId: no oral check of this student covers ${item.code}`, "itemId");
    if (inForce.length === 0) basis = candidates[0];
    else basis = inForce.find((c) => c.itemOutcomes.find((o) => o.itemId === item.id)?.meets) ?? inForce[0];
  }
  if (!basis) throw new RecordRefusal("no_check", `itemId: no oral check of this student covers ${item.code}`, "itemId");
  if (basis.withdrawn)
    throw new RecordRefusal(
      "check_withdrawn",
      `basisCheckId: the oral check of ${dateInZone(basis.occurredAt, school.timeZone)} on ${item.code} was withdrawn`,
      "basisCheckId",
    );
  if (!levelReaches(basis.levelShown, item.requiredLevel)) {
    throw new RecordRefusal(
      "level_below_required",
      `basisCheckId: the check showed ${LEVEL_LABEL[basis.levelShown].toLowerCase()}; ${item.code} requires ${LEVEL_LABEL[item.requiredLevel].toLowerCase()}`,
      "basisCheckId",
    );
  }
  if (!basis.itemOutcomes.find((o) => o.itemId === item.id)?.meets) {
    throw new RecordRefusal(
      "not_meeting_standard",
      `basisCheckId: no oral check of this student on ${item.code} meets the standard`,
      "basisCheckId",
    );
  }
  const checkDate = dateInZone(basis.occurredAt, school.timeZone);
  const oldest = format(addDays(parseISO(signedOn), -school.settings.checkValidityDays), "yyyy-MM-dd");
  if (checkDate < oldest) {
    throw new RecordRefusal(
      "check_expired",
      `basisCheckId: the check of ${checkDate} is older than the school's limit of ${school.settings.checkValidityDays} days`,
      "basisCheckId",
    );
  }
  return {
    student,
    item,
    basis,
    signedOn,
    statement: statementText({ signerName: user.name, studentName: student.name, item, basis, signedOn, timeZone: school.timeZone }),
    signerName: user.name,
  };
}

function signatureOf(fields: Record<string, string | number | null>): string {
  const canonical = JSON.stringify(
    Object.keys(fields)
      .sort()
      .map((k) => [k, fields[k]]),
  );
  return createHash("sha256").update(canonical).digest("hex");
}

async function confirmPassword(user: CurrentUser, password: string, t?: Transaction) {
  const [row] = await sequelize.query<{ password_hash: string | null }>(`SELECT password_hash FROM people WHERE id = :id`, {
    replacements: { id: user.id },
    type: QueryTypes.SELECT,
    transaction: t,
  });
  if (!(await verifyPassword(password, row?.password_hash)))
    throw new RecordRefusal("wrong_password", "password: does not match your password", "password");
}

interface CurrentSignOff {
  id: string;
  generation: number;
  signer_id: string;
  withdrawn: boolean;
}
async function latestSignOff(studentId: string, itemId: string, t?: Transaction): Promise<CurrentSignOff | null> {
  const [r] = await sequelize.query<CurrentSignOff>(
    `SELECT s.id, s.generation, s.signer_id, EXISTS (SELECT 1 FROM sign_off_withdrawals w WHERE w.sign_off_id = s.id) AS withdrawn
       FROM sign_offs s WHERE s.student_id = :studentId AND s.syllabus_item_id = :itemId ORDER BY s.generation DESC LIMIT 1`,
    { replacements: { studentId, itemId }, type: QueryTypes.SELECT, transaction: t },
  );
  return r ?? null;
}

async function insertSignOff(
  t: Transaction,
  user: CurrentUser,
  plan: SignOffPlan,
  generation: number,
  amends: { id: string; reason: string } | null,
) {
  const signedAt = now();
  const fields = {
    statement: plan.statement,
    studentId: plan.student.id,
    itemId: plan.item.id,
    basisCheckId: plan.basis.id,
    signerId: user.id,
    signedOn: plan.signedOn,
    signedAt: signedAt.toISOString(),
    generation,
    amendsId: amends?.id ?? null,
  };
  const signatureHash = signatureOf(fields);
  const [row] = await sequelize.query<{ id: string }>(
    `INSERT INTO sign_offs (school_id, student_id, syllabus_item_id, enrolment_id, generation, basis_check_id, signer_id, statement, signed_on, signed_at, signature_hash, amends_id, amend_reason)
     VALUES (:schoolId, :studentId, :itemId, :enrolmentId, :generation, :basis, :signer, :statement, :signedOn, :signedAt, :hash, :amendsId, :reason)
     ON CONFLICT (student_id, syllabus_item_id, generation) DO NOTHING RETURNING id`,
    {
      transaction: t,
      type: QueryTypes.SELECT,
      replacements: {
        schoolId: user.schoolId,
        studentId: plan.student.id,
        itemId: plan.item.id,
        enrolmentId: plan.student.enrolmentId,
        generation,
        basis: plan.basis.id,
        signer: user.id,
        statement: plan.statement,
        signedOn: plan.signedOn,
        signedAt,
        hash: signatureHash,
        amendsId: amends?.id ?? null,
        reason: amends?.reason ?? null,
      },
    },
  );
  if (!row) throw new RecordRefusal("already_signed", `itemId: ${plan.item.code} is already signed off for this student`, "itemId");
  await writeAudit(t, {
    schoolId: user.schoolId,
    actor: user,
    action: amends ? "signoff.amended" : "signoff.signed",
    recordType: "sign_off",
    recordId: row.id,
    before: amends ? { signOffId: amends.id } : undefined,
    after: { ...fields, itemCode: plan.item.code, signatureHash, ...(amends ? { reason: amends.reason } : {}) },
    occurredAt: signedAt,
  });
  return { id: row.id, signatureHash, signedAt, generation };
}

/**
 * Signs off an item: checks the basis (refusing with the reason), the signer's password,
 * that no sign-off is current, writes the signed record, the audit event and the student's mail.
 */
export async function signOff(t: Transaction, user: CurrentUser, input: SignOffInput) {
  const plan = await planSignOff(user, input, t);
  const latest = await latestSignOff(plan.student.id, plan.item.id, t);
  if (latest && !latest.withdrawn)
    throw new RecordRefusal("already_signed", `itemId: ${plan.item.code} is already signed off for this student`, "itemId");
  await confirmPassword(user, input.password, t);
  const result = await insertSignOff(t, user, plan, (latest?.generation ?? 0) + 1, null);
  const school = await schoolFor(user.schoolId, t);
  const mail = composeMail(
    "record.signed",
    { name: plan.student.name, itemCode: plan.item.code, itemTitle: plan.item.title, signerName: user.name, signedOn: plan.signedOn },
    { name: school.name, timeZone: school.timeZone, senderName: school.settings.mailSenderName },
  );
  await enqueueMail(t, {
    schoolId: user.schoolId,
    kind: "record.signed",
    idempotencyKey: `record.signed:${result.id}:${plan.student.id}`,
    recipientId: plan.student.id,
    to: plan.student.email,
    ...mail,
  });
  return { ...result, statement: plan.statement, itemCode: plan.item.code };
}

async function ownSignOff(t: Transaction, user: CurrentUser, signOffId: string) {
  const [s] = await sequelize.query<{
    id: string;
    student_id: string;
    syllabus_item_id: string;
    signer_id: string;
    generation: number;
    basis_check_id: string;
  }>(
    `SELECT id, student_id, syllabus_item_id, signer_id, generation, basis_check_id FROM sign_offs WHERE id = :id AND school_id = :schoolId`,
    { replacements: { id: signOffId, schoolId: user.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!s) throw new HttpError(404, "signOffId: no such sign-off", "signOffId");
  await requireStudentFor(user, s.student_id, "staff", t);
  if (!user.roles.includes("chief") && s.signer_id !== user.id)
    throw new HttpError(403, "signOffId: only the signer or the chief instructor may change a sign-off", "signOffId");
  const latest = await latestSignOff(s.student_id, s.syllabus_item_id, t);
  if (!latest || latest.id !== s.id || latest.withdrawn)
    throw new HttpError(409, "signOffId: this sign-off is no longer current", "signOffId");
  return s;
}

/** Withdraws a current sign-off with a reason; the item can then be signed again. */
export async function withdrawSignOff(t: Transaction, user: CurrentUser, input: { signOffId: string; reason: string }) {
  const s = await ownSignOff(t, user, input.signOffId);
  const at = now();
  const [row] = await sequelize.query<{ sign_off_id: string }>(
    `INSERT INTO sign_off_withdrawals (sign_off_id, withdrawn_by, reason, withdrawn_at) VALUES (:id, :by, :reason, :at) ON CONFLICT DO NOTHING RETURNING sign_off_id`,
    { replacements: { id: s.id, by: user.id, reason: input.reason.trim(), at }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!row) throw new HttpError(409, "signOffId: already withdrawn", "signOffId");
  await writeAudit(t, {
    schoolId: user.schoolId,
    actor: user,
    action: "signoff.withdrawn",
    recordType: "sign_off",
    recordId: s.id,
    before: { state: "current" },
    after: { state: "withdrawn", reason: input.reason.trim() },
    occurredAt: at,
  });
  return { signOffId: s.id };
}

/** Amends a current sign-off: a new signed record that refers to the original, with a reason. */
export async function amendSignOff(
  t: Transaction,
  user: CurrentUser,
  input: { signOffId: string; reason: string; basisCheckId?: string | undefined; signedOn?: string | undefined; password: string },
) {
  const s = await ownSignOff(t, user, input.signOffId);
  const plan = await planSignOff(
    user,
    { studentId: s.student_id, itemId: s.syllabus_item_id, basisCheckId: input.basisCheckId, signedOn: input.signedOn },
    t,
  );
  await confirmPassword(user, input.password, t);
  return insertSignOff(t, user, plan, s.generation + 1, { id: s.id, reason: input.reason.trim() });
}

/** The current sign-off per item of a student (derived: newest generation, not withdrawn). */
export async function currentSignOffs(studentId: string, t?: Transaction) {
  return sequelize
    .query<{ id: string; itemId: string; signerName: string; signedOn: string; signedAt: Date; generation: number }>(
      `SELECT DISTINCT ON (s.syllabus_item_id) s.id, s.syllabus_item_id AS "itemId", p.name AS "signerName", s.signed_on AS "signedOn", s.signed_at AS "signedAt", s.generation,
            EXISTS (SELECT 1 FROM sign_off_withdrawals w WHERE w.sign_off_id = s.id) AS withdrawn
       FROM sign_offs s JOIN people p ON p.id = s.signer_id
      WHERE s.student_id = :studentId
      ORDER BY s.syllabus_item_id, s.generation DESC`,
      { replacements: { studentId }, type: QueryTypes.SELECT, transaction: t },
    )
    .then((rows) => rows.filter((r) => !(r as unknown as { withdrawn: boolean }).withdrawn));
}
