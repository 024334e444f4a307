import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import { Assignment, type AssignmentKind } from "../../models";
import { HttpError } from "@/lib/http/errors";
import { can } from "@/lib/auth/can";
import type { CurrentUser } from "@/lib/auth/session";
import { enqueueMail } from "../mail/outbox";
import { getSchool } from "../shared/school";
import { composeMail } from "@/lib/mail/compose";
import { schoolToday } from "./school-today";
import { capCreates } from "../shared/create-cap";

// Assignments: a briefing or a demo to review by a calendar date (the school's), for a cohort
// (its current members) or one student. Creating them mails each student in the same transaction.

export interface NewAssignmentInput {
  kind: AssignmentKind;
  briefingId?: string | null;
  demoId?: string | null;
  cohortId?: string | null;
  studentIds?: string[];
  dueOn: string;
  note?: string;
}

/** Cohorts a staff member may assign to: one who may see every student any of the school's, an instructor those they lead. */
async function assignableCohort(caller: CurrentUser, cohortId: string, t: Transaction) {
  const [c] = await sequelize.query<{ id: string; leadInstructorId: string }>(
    `SELECT id, lead_instructor_id AS "leadInstructorId" FROM cohorts WHERE id = :cohortId AND school_id = :schoolId`,
    { replacements: { cohortId, schoolId: caller.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!c) throw new HttpError(404, "cohortId: no such cohort", "cohortId");
  if (!can(caller, "students.all") && c.leadInstructorId !== caller.id)
    throw new HttpError(403, "cohortId: you do not lead this cohort", "cohortId");
  return c;
}

async function assignableStudents(caller: CurrentUser, studentIds: string[], t: Transaction) {
  const rows = await sequelize.query<{ id: string; lead: boolean }>(
    `SELECT p.id,
            EXISTS (SELECT 1 FROM cohort_memberships m JOIN cohorts c ON c.id = m.cohort_id
                     WHERE m.student_id = p.id AND m.to_date IS NULL AND c.lead_instructor_id = :viewer) AS lead
       FROM people p WHERE p.id IN (:ids) AND p.school_id = :schoolId AND 'student' = ANY(p.roles) AND p.active`,
    { replacements: { ids: studentIds, schoolId: caller.schoolId, viewer: caller.id }, type: QueryTypes.SELECT, transaction: t },
  );
  if (rows.length !== studentIds.length) throw new HttpError(404, "studentIds: no such student", "studentIds");
  if (!can(caller, "students.all") && rows.some((r) => !r.lead))
    throw new HttpError(403, "studentIds: not a student of a cohort you lead", "studentIds");
}

/**
 * Creates the assignment (one row for a cohort, one per named student) and writes an
 * `assignment.new` mail per student into the outbox in the same transaction.
 */
export async function createAssignments(
  caller: CurrentUser,
  input: NewAssignmentInput,
  t: Transaction,
): Promise<{ ids: string[]; mailed: number }> {
  let title: string;
  if (input.kind === "briefing") {
    const [b] = await sequelize.query<{ title: string }>(
      `SELECT r.title FROM briefings b JOIN briefing_revisions r ON r.id = b.current_revision_id WHERE b.id = :id AND b.school_id = :schoolId`,
      { replacements: { id: input.briefingId ?? null, schoolId: caller.schoolId }, type: QueryTypes.SELECT, transaction: t },
    );
    if (!b) throw new HttpError(404, "briefingId: no such briefing", "briefingId");
    title = b.title;
  } else {
    const [d] = await sequelize.query<{ name: string }>(
      `SELECT name FROM demos WHERE id = :id AND school_id = :schoolId AND deleted_at IS NULL`,
      { replacements: { id: input.demoId ?? null, schoolId: caller.schoolId }, type: QueryTypes.SELECT, transaction: t },
    );
    if (!d) throw new HttpError(404, "demoId: no such demo", "demoId");
    title = d.name;
  }
  const today = await schoolToday(caller.schoolId, t);
  if (input.dueOn < today) throw new HttpError(400, "dueOn: the due date is in the past", "dueOn");

  await capCreates(t, caller, "assignments");
  const base = {
    schoolId: caller.schoolId,
    kind: input.kind,
    briefingId: input.kind === "briefing" ? input.briefingId! : null,
    demoId: input.kind === "demo" ? input.demoId! : null,
    dueOn: input.dueOn,
    note: input.note ?? "",
    assignedBy: caller.id,
  };
  const created: Assignment[] = [];
  if (input.cohortId) {
    await assignableCohort(caller, input.cohortId, t);
    created.push(await Assignment.create({ ...base, cohortId: input.cohortId, studentId: null }, { transaction: t }));
  } else {
    const ids = [...new Set(input.studentIds ?? [])];
    if (ids.length === 0) throw new HttpError(400, "studentIds: choose a cohort or at least one student", "studentIds");
    await assignableStudents(caller, ids, t);
    for (const sid of ids) created.push(await Assignment.create({ ...base, cohortId: null, studentId: sid }, { transaction: t }));
  }

  const recipients = await sequelize.query<{ assignmentId: string; studentId: string; name: string; email: string }>(
    `SELECT s.assignment_id AS "assignmentId", p.id AS "studentId", p.name, p.email
       FROM assignment_students s JOIN people p ON p.id = s.student_id
      WHERE s.assignment_id IN (:ids) AND p.active`,
    { replacements: { ids: created.map((a) => a.id) }, type: QueryTypes.SELECT, transaction: t },
  );
  const school = await getSchool(caller.schoolId, t);
  let mailed = 0;
  for (const r of recipients) {
    const mail = composeMail(
      "assignment.new",
      { name: r.name, title, assignmentKind: input.kind, dueOn: input.dueOn, path: `/assignments#a-${r.assignmentId}` },
      { name: school.name, timeZone: school.timeZone },
    );
    const wrote = await enqueueMail(t, {
      schoolId: caller.schoolId,
      kind: "assignment.new",
      idempotencyKey: `assignment.new:${r.assignmentId}:${r.studentId}`,
      recipientId: r.studentId,
      to: r.email,
      ...mail,
    });
    if (wrote) mailed++;
  }
  return { ids: created.map((a) => a.id), mailed };
}
