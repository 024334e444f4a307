import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../index";
import { Assignment, AssignmentCompletion, type AssignmentKind } from "../models";
import { HttpError } from "@/lib/http/errors";
import { now } from "@/lib/clock";
import { dateInZone } from "@/lib/time";
import { enqueueMail } from "./outbox";
import { composeMail } from "@/lib/mail/compose";
import { tableExists } from "./briefings";

// Assignments: a briefing or a demo to review by a calendar date (the school's), for a cohort
// (its current members) or one student. "Overdue" is derived from the date here, never stored.

export interface AssignedDemo {
  assignmentId: string;
  demoId: string;
  demoRevisionId: string;
  name: string;
  dueOn: string;
  viaBriefingTitle: string | null;
}

/**
 * The demos assigned to a student: demos assigned directly (their current revision) and the
 * demos used by the current revision of briefings assigned to them. Deleted demos are left out.
 */
export async function listAssignedDemosForStudent(schoolId: string, studentId: string): Promise<AssignedDemo[]> {
  if (!(await tableExists("demos"))) return [];
  return sequelize.query<AssignedDemo>(
    `SELECT s.assignment_id AS "assignmentId", d.id AS "demoId", d.current_revision_id AS "demoRevisionId", d.name,
            s.due_on AS "dueOn", NULL::text AS "viaBriefingTitle"
       FROM assignment_students s JOIN demos d ON d.id = s.demo_id
      WHERE s.school_id = :schoolId AND s.student_id = :studentId AND s.kind = 'demo'
        AND d.deleted_at IS NULL AND d.current_revision_id IS NOT NULL
     UNION ALL
     SELECT s.assignment_id, d.id, brd.demo_revision_id, d.name, s.due_on, br.title
       FROM assignment_students s
       JOIN briefings b ON b.id = s.briefing_id
       JOIN briefing_revisions br ON br.id = b.current_revision_id
       JOIN briefing_revision_demos brd ON brd.briefing_revision_id = br.id
       JOIN demo_revisions dr ON dr.id = brd.demo_revision_id
       JOIN demos d ON d.id = dr.demo_id
      WHERE s.school_id = :schoolId AND s.student_id = :studentId AND s.kind = 'briefing' AND d.deleted_at IS NULL
      ORDER BY "dueOn", name`,
    { replacements: { schoolId, studentId }, type: QueryTypes.SELECT },
  );
}

/** Whether a demo is assigned to a student, directly or through an assigned briefing's current revision. */
export async function isDemoAssignedToStudent(schoolId: string, demoId: string, studentId: string): Promise<boolean> {
  const demos = await listAssignedDemosForStudent(schoolId, studentId);
  return demos.some((d) => d.demoId === demoId);
}

// ---------------------------------------------------------------------------------------------

export interface Viewer {
  id: string;
  schoolId: string;
  roles: readonly string[];
}

async function schoolTz(schoolId: string, t?: Transaction): Promise<string> {
  const [row] = await sequelize.query<{ tz: string }>(`SELECT time_zone AS tz FROM schools WHERE id = :schoolId`, {
    replacements: { schoolId },
    type: QueryTypes.SELECT,
    transaction: t,
  });
  if (!row) throw new HttpError(404, "school: not found");
  return row.tz;
}

/** Today's calendar date in the school's time zone, from the injectable clock. */
export async function schoolToday(schoolId: string): Promise<string> {
  return dateInZone(now(), await schoolTz(schoolId));
}

/** Overdue: not done and the due date has passed in the school's calendar (due today is not overdue). */
export function isOverdue(dueOn: string, done: boolean, today: string): boolean {
  return !done && dueOn < today;
}

export interface NewAssignmentInput {
  kind: AssignmentKind;
  briefingId?: string | null;
  demoId?: string | null;
  cohortId?: string | null;
  studentIds?: string[];
  dueOn: string;
  note?: string;
}

/** Cohorts a staff member may assign to: the chief all of the school's, an instructor those they lead. */
async function assignableCohort(viewer: Viewer, cohortId: string, t: Transaction) {
  const [c] = await sequelize.query<{ id: string; leadInstructorId: string }>(
    `SELECT id, lead_instructor_id AS "leadInstructorId" FROM cohorts WHERE id = :cohortId AND school_id = :schoolId`,
    { replacements: { cohortId, schoolId: viewer.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!c) throw new HttpError(404, "cohortId: no such cohort", "cohortId");
  if (!viewer.roles.includes("chief") && c.leadInstructorId !== viewer.id)
    throw new HttpError(403, "cohortId: you do not lead this cohort", "cohortId");
  return c;
}

async function assignableStudents(viewer: Viewer, studentIds: string[], t: Transaction) {
  const rows = await sequelize.query<{ id: string; lead: boolean }>(
    `SELECT p.id,
            EXISTS (SELECT 1 FROM cohort_memberships m JOIN cohorts c ON c.id = m.cohort_id
                     WHERE m.student_id = p.id AND m.to_date IS NULL AND c.lead_instructor_id = :viewer) AS lead
       FROM people p WHERE p.id IN (:ids) AND p.school_id = :schoolId AND 'student' = ANY(p.roles) AND p.active`,
    { replacements: { ids: studentIds, schoolId: viewer.schoolId, viewer: viewer.id }, type: QueryTypes.SELECT, transaction: t },
  );
  if (rows.length !== studentIds.length) throw new HttpError(404, "studentIds: no such student", "studentIds");
  if (!viewer.roles.includes("chief") && rows.some((r) => !r.lead))
    throw new HttpError(403, "studentIds: not a student of a cohort you lead", "studentIds");
}

/**
 * Creates the assignment (one row for a cohort, one per named student) and writes an
 * `assignment.new` mail per student into the outbox in the same transaction.
 */
export async function createAssignments(
  viewer: Viewer,
  input: NewAssignmentInput,
  t: Transaction,
): Promise<{ ids: string[]; mailed: number }> {
  let title: string;
  if (input.kind === "briefing") {
    const [b] = await sequelize.query<{ title: string }>(
      `SELECT r.title FROM briefings b JOIN briefing_revisions r ON r.id = b.current_revision_id WHERE b.id = :id AND b.school_id = :schoolId`,
      { replacements: { id: input.briefingId ?? null, schoolId: viewer.schoolId }, type: QueryTypes.SELECT, transaction: t },
    );
    if (!b) throw new HttpError(404, "briefingId: no such briefing", "briefingId");
    title = b.title;
  } else {
    const d = (await tableExists("demos"))
      ? (
          await sequelize.query<{ name: string }>(
            `SELECT name FROM demos WHERE id = :id AND school_id = :schoolId AND deleted_at IS NULL`,
            {
              replacements: { id: input.demoId ?? null, schoolId: viewer.schoolId },
              type: QueryTypes.SELECT,
              transaction: t,
            },
          )
        )[0]
      : undefined;
    if (!d) throw new HttpError(404, "demoId: no such demo", "demoId");
    title = d.name;
  }
  const tz = await schoolTz(viewer.schoolId, t);
  const today = dateInZone(now(), tz);
  if (input.dueOn < today) throw new HttpError(400, "dueOn: the due date is in the past", "dueOn");

  const base = {
    schoolId: viewer.schoolId,
    kind: input.kind,
    briefingId: input.kind === "briefing" ? input.briefingId! : null,
    demoId: input.kind === "demo" ? input.demoId! : null,
    dueOn: input.dueOn,
    note: input.note ?? "",
    assignedBy: viewer.id,
  };
  const created: Assignment[] = [];
  if (input.cohortId) {
    await assignableCohort(viewer, input.cohortId, t);
    created.push(await Assignment.create({ ...base, cohortId: input.cohortId, studentId: null }, { transaction: t }));
  } else {
    const ids = [...new Set(input.studentIds ?? [])];
    if (ids.length === 0) throw new HttpError(400, "studentIds: choose a cohort or at least one student", "studentIds");
    await assignableStudents(viewer, ids, t);
    for (const sid of ids) created.push(await Assignment.create({ ...base, cohortId: null, studentId: sid }, { transaction: t }));
  }

  const recipients = await sequelize.query<{ assignmentId: string; studentId: string; name: string; email: string }>(
    `SELECT s.assignment_id AS "assignmentId", p.id AS "studentId", p.name, p.email
       FROM assignment_students s JOIN people p ON p.id = s.student_id
      WHERE s.assignment_id IN (:ids) AND p.active`,
    { replacements: { ids: created.map((a) => a.id) }, type: QueryTypes.SELECT, transaction: t },
  );
  const [school] = await sequelize.query<{ name: string; timeZone: string }>(
    `SELECT name, time_zone AS "timeZone" FROM schools WHERE id = :id`,
    {
      replacements: { id: viewer.schoolId },
      type: QueryTypes.SELECT,
      transaction: t,
    },
  );
  let mailed = 0;
  for (const r of recipients) {
    const mail = composeMail(
      "assignment.new",
      { name: r.name, title, assignmentKind: input.kind, dueOn: input.dueOn, path: `/assignments#a-${r.assignmentId}` },
      { name: school!.name, timeZone: school!.timeZone },
    );
    const wrote = await enqueueMail(t, {
      schoolId: viewer.schoolId,
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

export interface StudentAssignment {
  id: string;
  kind: AssignmentKind;
  title: string;
  briefingId: string | null;
  demoId: string | null;
  dueOn: string;
  note: string;
  assignedByName: string;
  completedAt: Date | null;
  done: boolean;
  overdue: boolean;
}

/** A student's own assignments, soonest first, with done and overdue derived for the school's today. */
export async function listAssignmentsForStudent(
  schoolId: string,
  studentId: string,
  opts: { from?: string; to?: string } = {},
): Promise<StudentAssignment[]> {
  const today = await schoolToday(schoolId);
  const hasDemos = await tableExists("demos");
  const rows = await sequelize.query<Omit<StudentAssignment, "done" | "overdue">>(
    `SELECT s.assignment_id AS id, s.kind, s.briefing_id AS "briefingId", s.demo_id AS "demoId", s.due_on AS "dueOn",
            a.note, ap.name AS "assignedByName", s.completed_at AS "completedAt",
            COALESCE(br.title, ${hasDemos ? "(SELECT name FROM demos WHERE id = s.demo_id)" : "NULL"}, '—') AS title
       FROM assignment_students s
       JOIN assignments a ON a.id = s.assignment_id
       JOIN people ap ON ap.id = a.assigned_by
       LEFT JOIN briefings b ON b.id = s.briefing_id
       LEFT JOIN briefing_revisions br ON br.id = b.current_revision_id
      WHERE s.school_id = :schoolId AND s.student_id = :studentId
        AND (:from::date IS NULL OR s.due_on >= :from::date) AND (:to::date IS NULL OR s.due_on <= :to::date)
      ORDER BY s.completed_at IS NOT NULL, s.due_on, title`,
    { replacements: { schoolId, studentId, from: opts.from ?? null, to: opts.to ?? null }, type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({ ...r, done: r.completedAt !== null, overdue: isOverdue(r.dueOn, r.completedAt !== null, today) }));
}

/** A student marks their own assignment done (or not done again). 404 when it is not theirs. */
export async function setAssignmentDone(viewer: Viewer, assignmentId: string, done: boolean, t: Transaction): Promise<{ done: boolean }> {
  const [mine] = await sequelize.query<{ id: string }>(
    `SELECT assignment_id AS id FROM assignment_students WHERE assignment_id = :assignmentId AND student_id = :sid AND school_id = :schoolId`,
    { replacements: { assignmentId, sid: viewer.id, schoolId: viewer.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!mine) throw new HttpError(404, "assignmentId: no such assignment of yours", "assignmentId");
  if (done) {
    await sequelize.query(
      `INSERT INTO assignment_completions (assignment_id, student_id, completed_at) VALUES (:assignmentId, :sid, :at)
       ON CONFLICT (assignment_id, student_id) DO NOTHING`,
      { replacements: { assignmentId, sid: viewer.id, at: now() }, transaction: t },
    );
  } else {
    await AssignmentCompletion.destroy({ where: { assignmentId, studentId: viewer.id }, transaction: t });
  }
  return { done };
}

export interface StaffAssignmentRow {
  id: string;
  kind: AssignmentKind;
  title: string;
  briefingId: string | null;
  demoId: string | null;
  target: string;
  cohortId: string | null;
  dueOn: string;
  assignedByName: string;
  students: number;
  done: number;
  overdue: number;
}

/** Assignments a staff member sees: the chief the school's, an instructor those for students of cohorts they lead or that they set. */
export async function listAssignmentsForStaff(viewer: Viewer): Promise<StaffAssignmentRow[]> {
  const today = await schoolToday(viewer.schoolId);
  const hasDemos = await tableExists("demos");
  return sequelize.query<StaffAssignmentRow>(
    `SELECT a.id, a.kind, a.briefing_id AS "briefingId", a.demo_id AS "demoId", a.cohort_id AS "cohortId", a.due_on AS "dueOn",
            COALESCE(br.title, ${hasDemos ? "(SELECT name FROM demos WHERE id = a.demo_id)" : "NULL"}, '—') AS title,
            COALESCE(c.name, sp.name) AS target, ap.name AS "assignedByName",
            (SELECT count(*)::int FROM assignment_students s WHERE s.assignment_id = a.id) AS students,
            (SELECT count(*)::int FROM assignment_students s WHERE s.assignment_id = a.id AND s.completed_at IS NOT NULL) AS done,
            (SELECT count(*)::int FROM assignment_students s WHERE s.assignment_id = a.id AND s.completed_at IS NULL AND s.due_on < :today::date) AS overdue
       FROM assignments a
       JOIN people ap ON ap.id = a.assigned_by
       LEFT JOIN cohorts c ON c.id = a.cohort_id
       LEFT JOIN people sp ON sp.id = a.student_id
       LEFT JOIN briefings b ON b.id = a.briefing_id
       LEFT JOIN briefing_revisions br ON br.id = b.current_revision_id
      WHERE a.school_id = :schoolId
        AND (:chief OR a.assigned_by = :viewer OR c.lead_instructor_id = :viewer
             OR EXISTS (SELECT 1 FROM cohort_memberships m JOIN cohorts mc ON mc.id = m.cohort_id
                         WHERE m.student_id = a.student_id AND m.to_date IS NULL AND mc.lead_instructor_id = :viewer))
      ORDER BY a.due_on DESC, title`,
    {
      replacements: { schoolId: viewer.schoolId, viewer: viewer.id, chief: viewer.roles.includes("chief"), today },
      type: QueryTypes.SELECT,
    },
  );
}

export interface CompletionRow {
  studentId: string;
  name: string;
  completedAt: Date | null;
  done: boolean;
  overdue: boolean;
}

/** Completion across the students of one assignment, for staff who may see it; null when not visible. */
export async function assignmentCompletion(
  viewer: Viewer,
  assignmentId: string,
): Promise<{ assignment: StaffAssignmentRow; rows: CompletionRow[] } | null> {
  const visible = (await listAssignmentsForStaff(viewer)).find((a) => a.id === assignmentId);
  if (!visible) return null;
  const today = await schoolToday(viewer.schoolId);
  const rows = await sequelize.query<{ studentId: string; name: string; completedAt: Date | null; dueOn: string }>(
    `SELECT s.student_id AS "studentId", p.name, s.completed_at AS "completedAt", s.due_on AS "dueOn"
       FROM assignment_students s JOIN people p ON p.id = s.student_id
      WHERE s.assignment_id = :assignmentId ORDER BY p.name`,
    { replacements: { assignmentId }, type: QueryTypes.SELECT },
  );
  return {
    assignment: visible,
    rows: rows.map((r) => ({
      studentId: r.studentId,
      name: r.name,
      completedAt: r.completedAt,
      done: r.completedAt !== null,
      overdue: isOverdue(r.dueOn, r.completedAt !== null, today),
    })),
  };
}

/** Whether a briefing is assigned to a student (directly or through their current cohort). */
export async function isBriefingAssignedToStudent(schoolId: string, briefingId: string, studentId: string): Promise<boolean> {
  const [row] = await sequelize.query<{ n: number }>(
    `SELECT count(*)::int AS n FROM assignment_students WHERE school_id = :schoolId AND briefing_id = :briefingId AND student_id = :studentId`,
    { replacements: { schoolId, briefingId, studentId }, type: QueryTypes.SELECT },
  );
  return (row?.n ?? 0) > 0;
}

export interface AssignmentChoices {
  briefings: { id: string; title: string }[];
  demos: { id: string; name: string }[];
  cohorts: { id: string; name: string }[];
  students: { id: string; name: string; cohortName: string }[];
}

/** What a staff member may assign, and to whom: the chief the whole school, an instructor the cohorts they lead. */
export async function assignmentChoices(viewer: Viewer): Promise<AssignmentChoices> {
  const chief = viewer.roles.includes("chief");
  const r = { schoolId: viewer.schoolId, viewer: viewer.id, chief };
  const briefings = await sequelize.query<{ id: string; title: string }>(
    `SELECT b.id, r.title FROM briefings b JOIN briefing_revisions r ON r.id = b.current_revision_id WHERE b.school_id = :schoolId ORDER BY lower(r.title)`,
    { replacements: r, type: QueryTypes.SELECT },
  );
  const demos = (await tableExists("demos"))
    ? await sequelize.query<{ id: string; name: string }>(
        `SELECT id, name FROM demos WHERE school_id = :schoolId AND deleted_at IS NULL AND current_revision_id IS NOT NULL ORDER BY lower(name)`,
        { replacements: r, type: QueryTypes.SELECT },
      )
    : [];
  const cohorts = await sequelize.query<{ id: string; name: string }>(
    `SELECT id, name FROM cohorts WHERE school_id = :schoolId AND (:chief OR lead_instructor_id = :viewer) ORDER BY starts_on, name`,
    { replacements: r, type: QueryTypes.SELECT },
  );
  const students = await sequelize.query<{ id: string; name: string; cohortName: string }>(
    `SELECT p.id, p.name, c.name AS "cohortName" FROM cohort_memberships m JOIN cohorts c ON c.id = m.cohort_id JOIN people p ON p.id = m.student_id
      WHERE c.school_id = :schoolId AND m.to_date IS NULL AND p.active AND (:chief OR c.lead_instructor_id = :viewer)
      ORDER BY c.name, p.name`,
    { replacements: r, type: QueryTypes.SELECT },
  );
  return { briefings, demos, cohorts, students };
}
