import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../index";
import type { CurrentUser } from "@/lib/auth/session";
import { HttpError } from "@/lib/http/errors";
import type { LevelOfLearning } from "@/lib/records/outcome";
import { School } from "../models";
import { DEFAULT_SETTINGS } from "./school";

// Shared lookups of the Records area, and the read side: the Progress map, the Sign-off
// register with its watch notes, the chief's summary and the training record.

const tableCache = new Map<string, boolean>();
/** Whether another area's table exists yet (cached once true). */
export async function tableExists(name: string, t?: Transaction): Promise<boolean> {
  if (tableCache.get(name)) return true;
  const [r] = await sequelize.query<{ ok: boolean }>(`SELECT to_regclass(:n) IS NOT NULL AS ok`, { replacements: { n: `public.${name}` }, type: QueryTypes.SELECT, transaction: t });
  const ok = !!r?.ok;
  if (ok) tableCache.set(name, true);
  return ok;
}

export interface StudentRef {
  id: string;
  name: string;
  email: string;
  enrolmentId: string;
  courseId: string;
  courseCode: string;
  courseTitle: string;
  minGroundMinutes: number;
  revisionId: string;
  enrolledOn: string;
  cohortId: string | null;
  cohortName: string | null;
  leadInstructorId: string | null;
  leadInstructorName: string | null;
}

async function studentRef(schoolId: string, studentId: string, t?: Transaction): Promise<StudentRef | null> {
  const [row] = await sequelize.query<StudentRef>(
    `SELECT p.id, p.name, p.email, e.id AS "enrolmentId", co.id AS "courseId", co.code AS "courseCode", co.title AS "courseTitle",
            co.min_ground_minutes AS "minGroundMinutes", e.revision_id AS "revisionId", e.enrolled_on AS "enrolledOn",
            c.id AS "cohortId", c.name AS "cohortName", c.lead_instructor_id AS "leadInstructorId", lp.name AS "leadInstructorName"
       FROM people p
       JOIN enrolments e ON e.student_id = p.id AND e.status = 'active'
       JOIN courses co ON co.id = e.course_id
       LEFT JOIN cohort_memberships m ON m.student_id = p.id AND m.to_date IS NULL
       LEFT JOIN cohorts c ON c.id = m.cohort_id
       LEFT JOIN people lp ON lp.id = c.lead_instructor_id
      WHERE p.id = :studentId AND p.school_id = :schoolId AND 'student' = ANY(p.roles)
      ORDER BY e.enrolled_on DESC LIMIT 1`,
    { replacements: { studentId, schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  return row ?? null;
}

/** Students an instructor works with: members of cohorts they lead, and attendees of sessions they teach. */
export async function instructorStudentIds(user: Pick<CurrentUser, "id" | "schoolId">, t?: Transaction): Promise<Set<string>> {
  const sessions = await tableExists("session_attendees", t);
  const rows = await sequelize.query<{ id: string }>(
    `SELECT m.student_id AS id FROM cohort_memberships m JOIN cohorts c ON c.id = m.cohort_id
      WHERE c.lead_instructor_id = :uid AND c.school_id = :schoolId
     ${sessions ? `UNION SELECT a.student_id FROM session_attendees a JOIN training_sessions s ON s.id = a.session_id
      WHERE s.instructor_id = :uid AND s.school_id = :schoolId` : ""}`,
    { replacements: { uid: user.id, schoolId: user.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  return new Set(rows.map((r) => r.id));
}

export type ViewerAccess = "staff" | "self" | "sponsor";

/**
 * The student, if the viewer may see them for this purpose; otherwise a 404 that says nothing
 * about whether the student exists. `staff` = chief (school) or instructor (their students);
 * `view` adds the student themself and a linked sponsor to whom the student shares progress.
 */
export async function requireStudentFor(viewer: CurrentUser, studentId: string, purpose: "staff" | "view" | "examiner", t?: Transaction): Promise<{ student: StudentRef; access: ViewerAccess }> {
  const notFound = new HttpError(404, "studentId: no such student", "studentId");
  if (!/^[0-9a-f-]{36}$/i.test(studentId)) throw notFound;
  const student = await studentRef(viewer.schoolId, studentId, t);
  if (!student) throw notFound;
  if (viewer.roles.includes("chief")) return { student, access: "staff" };
  if (viewer.roles.includes("instructor") && (await instructorStudentIds(viewer, t)).has(studentId)) return { student, access: "staff" };
  if (purpose === "examiner" && viewer.roles.includes("instructor") && (await isCheckInstructor(viewer.id, t))) return { student, access: "staff" };
  if (purpose === "view") {
    if (viewer.roles.includes("student") && viewer.id === studentId) return { student, access: "self" };
    if (viewer.roles.includes("sponsor")) {
      const [link] = await sequelize.query<{ ok: boolean }>(
        `SELECT shares_progress AS ok FROM sponsor_links WHERE sponsor_id = :s AND student_id = :st`,
        { replacements: { s: viewer.id, st: studentId }, type: QueryTypes.SELECT, transaction: t },
      );
      if (link?.ok) return { student, access: "sponsor" };
    }
  }
  throw notFound;
}

export interface ItemRef {
  id: string;
  code: string;
  title: string;
  requiredLevel: LevelOfLearning;
  stageId: string;
  stageCode: string;
  stageTitle: string;
  stagePosition: number;
  position: number;
}

export async function itemsOfRevision(revisionId: string, t?: Transaction): Promise<ItemRef[]> {
  return sequelize.query<ItemRef>(
    `SELECT i.id, i.code, i.title, i.required_level AS "requiredLevel", s.id AS "stageId", s.code AS "stageCode", s.title AS "stageTitle",
            s.position AS "stagePosition", i.position
       FROM syllabus_items i JOIN syllabus_stages s ON s.id = i.stage_id
      WHERE i.revision_id = :revisionId ORDER BY s.position, i.position`,
    { replacements: { revisionId }, type: QueryTypes.SELECT, transaction: t },
  );
}

/** Stages whose stage check this student has passed (on this enrolment). */
export async function passedStageIds(studentId: string, enrolmentId: string, t?: Transaction): Promise<Set<string>> {
  const rows = await sequelize.query<{ stage_id: string }>(
    `SELECT DISTINCT stage_id FROM stage_checks WHERE student_id = :studentId AND enrolment_id = :enrolmentId AND result = 'pass'`,
    { replacements: { studentId, enrolmentId }, type: QueryTypes.SELECT, transaction: t },
  );
  return new Set(rows.map((r) => r.stage_id));
}

/** Refuses work on items of a stage whose previous stage's check is not passed. */
export async function assertStageOpen(student: StudentRef, items: ItemRef[], all: ItemRef[], field: string, t?: Transaction): Promise<void> {
  const passed = await passedStageIds(student.id, student.enrolmentId, t);
  for (const item of items) {
    if (item.stagePosition <= 1) continue;
    const prev = all.find((i) => i.stagePosition === item.stagePosition - 1);
    if (prev && !passed.has(prev.stageId)) {
      throw new RecordRefusal("stage_locked", `${field}: ${item.code} belongs to stage ${item.stageCode}; the stage check of ${prev.stageCode} is not passed yet`, field);
    }
  }
}

export type RefusalReason =
  | "no_check"
  | "not_meeting_standard"
  | "level_below_required"
  | "check_withdrawn"
  | "check_expired"
  | "makeup_open"
  | "signer_not_qualified"
  | "signer_not_current"
  | "stage_locked"
  | "already_signed"
  | "wrong_password"
  | "not_ready"
  | "examiner_not_allowed"
  | "examiner_is_lead"
  | "written_below_pass_mark";

/** A refusal of the Records rules: 422 (409 for a second sign-off) with a reason code and a message naming the field. */
export class RecordRefusal extends HttpError {
  constructor(
    public reason: RefusalReason,
    message: string,
    field?: string,
  ) {
    super(reason === "already_signed" ? 409 : 422, message, field);
    this.name = "RecordRefusal";
  }
}

/** Open make-up items (open or scheduled) of a student, by syllabus item. */
export async function openMakeupItemIds(studentId: string, t?: Transaction): Promise<Set<string>> {
  if (!(await tableExists("makeup_items", t))) return new Set();
  const rows = await sequelize.query<{ id: string }>(
    `SELECT DISTINCT syllabus_item_id AS id FROM makeup_items WHERE student_id = :studentId AND state IN ('open','scheduled')`,
    { replacements: { studentId }, type: QueryTypes.SELECT, transaction: t },
  );
  return new Set(rows.map((r) => r.id));
}

/** Designated check instructor (instructor_qualifications.check_instructor on any of their qualifications). */
export async function isCheckInstructor(personId: string, t?: Transaction): Promise<boolean> {
  const [r] = await sequelize.query<{ ok: boolean }>(
    `SELECT EXISTS (SELECT 1 FROM instructor_qualifications WHERE person_id = :p AND check_instructor) AS ok`,
    { replacements: { p: personId }, type: QueryTypes.SELECT, transaction: t },
  );
  return !!r?.ok;
}

/** The school with its settings, read inside the caller's transaction (no second connection). */
export async function schoolFor(schoolId: string, t?: Transaction) {
  const s = await School.findByPk(schoolId, { transaction: t });
  if (!s) throw new Error("School not found");
  return { id: s.id, name: s.name, timeZone: s.timeZone, settings: { ...DEFAULT_SETTINGS, ...s.settings } };
}
