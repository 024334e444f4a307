import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../index";
import type { CurrentUser } from "@/lib/auth/session";
import { HttpError } from "@/lib/http/errors";
import { School } from "../models";
import { DEFAULT_SETTINGS } from "./shared/school";
import { listChecksOfStudent, type CheckSummary } from "./oral-checks";
import { currentSignOffs, signerStanding } from "./sign-offs";
import { stageReadiness, type StageReadiness } from "./stage-checks";
import { creditedMinutesFor } from "./ground-hours";
import { chainHead, verifyChain } from "./audit";
import { dateInZone } from "@/lib/time";
import { now } from "@/lib/clock";
import { differenceInCalendarDays } from "date-fns";
import type { CheckOutcome, QuestionOutcome, LevelOfLearning } from "@/lib/records/outcome";

// Shared lookups of the Records area, and the read side: the Progress map, the Sign-off
// register with its watch notes, the chief's summary and the training record.

const tableCache = new Map<string, boolean>();
/** Whether another area's table exists yet (cached once true). */
export async function tableExists(name: string, t?: Transaction): Promise<boolean> {
  if (tableCache.get(name)) return true;
  const [r] = await sequelize.query<{ ok: boolean }>(`SELECT to_regclass(:n) IS NOT NULL AS ok`, {
    replacements: { n: `public.${name}` },
    type: QueryTypes.SELECT,
    transaction: t,
  });
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
     ${
       sessions
         ? `UNION SELECT a.student_id FROM session_attendees a JOIN training_sessions s ON s.id = a.session_id
      WHERE s.instructor_id = :uid AND s.school_id = :schoolId`
         : ""
     }`,
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
export async function requireStudentFor(
  viewer: CurrentUser,
  studentId: string,
  purpose: "staff" | "view" | "examiner",
  t?: Transaction,
): Promise<{ student: StudentRef; access: ViewerAccess }> {
  const notFound = new HttpError(404, "studentId: no such student", "studentId");
  if (!/^[0-9a-f-]{36}$/i.test(studentId)) throw notFound;
  const student = await studentRef(viewer.schoolId, studentId, t);
  if (!student) throw notFound;
  if (viewer.roles.includes("chief")) return { student, access: "staff" };
  if (viewer.roles.includes("instructor") && (await instructorStudentIds(viewer, t)).has(studentId)) return { student, access: "staff" };
  if (purpose === "examiner" && viewer.roles.includes("instructor") && (await isCheckInstructor(viewer.id, t)))
    return { student, access: "staff" };
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
export async function assertStageOpen(
  student: StudentRef,
  items: ItemRef[],
  all: ItemRef[],
  field: string,
  t?: Transaction,
): Promise<void> {
  const passed = await passedStageIds(student.id, student.enrolmentId, t);
  for (const item of items) {
    if (item.stagePosition <= 1) continue;
    const prev = all.find((i) => i.stagePosition === item.stagePosition - 1);
    if (prev && !passed.has(prev.stageId)) {
      throw new RecordRefusal(
        "stage_locked",
        `${field}: ${item.code} belongs to stage ${item.stageCode}; the stage check of ${prev.stageCode} is not passed yet`,
        field,
      );
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

// ---------------------------------------------------------------- the read side

export type ItemStatus = "not_started" | "checked" | "signed" | "stage_passed";
export const ITEM_STATUS_LABEL: Record<ItemStatus, string> = {
  not_started: "Not started",
  checked: "Checked",
  signed: "Signed off",
  stage_passed: "Stage passed",
};

export interface ProgressMap {
  student: { id: string; name: string; cohortName: string | null; courseCode: string; courseTitle: string; enrolledOn: string };
  access: ViewerAccess;
  stages: (StageReadiness & {
    items: {
      id: string;
      code: string;
      title: string;
      requiredLevel: LevelOfLearning;
      status: ItemStatus;
      lastOutcome: QuestionOutcome | null;
      lastCheckedOn: string | null;
      signedOn: string | null;
      signerName: string | null;
    }[];
  })[];
  ground: { minutes: number; minimumMinutes: number } | null;
  checks: CheckSummary[];
  /** per check date: how many question outcomes of each kind */
  chart: { date: string; solid: number; shaky: number; notYet: number }[];
}

/**
 * The Progress map of a student, for the viewer: the student themself, an instructor of their
 * cohorts, the chief, or a sponsor the student shares progress with. Remarks reach staff only;
 * a sponsor sees outcomes but not the questions and answers. Anyone else: 404.
 */
export async function progressFor(viewer: CurrentUser, studentId: string, opts: { asExaminer?: boolean } = {}): Promise<ProgressMap> {
  const { student, access } = await requireStudentFor(viewer, studentId, opts.asExaminer ? "examiner" : "view");
  const school = await schoolFor(viewer.schoolId);
  const items = await itemsOfRevision(student.revisionId);
  const stages = await stageReadiness(student);
  const signed = new Map((await currentSignOffs(student.id)).map((s) => [s.itemId, s]));
  const checks = await listChecksOfStudent(viewer.schoolId, student.id, { withRemarks: access === "staff" });
  const inForce = checks.filter((c) => !c.withdrawn && !c.amendedBy);
  const last = new Map<string, { outcome: QuestionOutcome; on: string }>();
  for (const c of [...inForce].reverse()) {
    for (const q of c.questions) last.set(q.itemCode, { outcome: q.outcome, on: dateInZone(c.occurredAt, school.timeZone) });
  }
  const passed = new Set(stages.filter((s) => s.passed).map((s) => s.stageId));
  const checkedItems = new Set(inForce.flatMap((c) => c.itemCodes));
  let ground: ProgressMap["ground"] = {
    minutes: await creditedMinutesFor(student.id, student.courseId),
    minimumMinutes: student.minGroundMinutes,
  };
  if (access === "sponsor") {
    const [link] = await sequelize.query<{ shares_hours: boolean }>(
      `SELECT shares_hours FROM sponsor_links WHERE sponsor_id = :s AND student_id = :st`,
      {
        replacements: { s: viewer.id, st: student.id },
        type: QueryTypes.SELECT,
      },
    );
    if (!link?.shares_hours) ground = null;
  }
  const chartMap = new Map<string, { solid: number; shaky: number; notYet: number }>();
  for (const c of [...inForce].reverse()) {
    const d = dateInZone(c.occurredAt, school.timeZone);
    const e = chartMap.get(d) ?? { solid: 0, shaky: 0, notYet: 0 };
    for (const q of c.questions) {
      if (q.outcome === "solid") e.solid++;
      else if (q.outcome === "shaky") e.shaky++;
      else e.notYet++;
    }
    chartMap.set(d, e);
  }
  return {
    student: {
      id: student.id,
      name: student.name,
      cohortName: student.cohortName,
      courseCode: student.courseCode,
      courseTitle: student.courseTitle,
      enrolledOn: student.enrolledOn,
    },
    access,
    stages: stages.map((s) => ({
      ...s,
      items: items
        .filter((i) => i.stageId === s.stageId)
        .map((i) => {
          const so = signed.get(i.id);
          const status: ItemStatus = passed.has(i.stageId)
            ? "stage_passed"
            : so
              ? "signed"
              : checkedItems.has(i.code)
                ? "checked"
                : "not_started";
          const l = last.get(i.code);
          return {
            id: i.id,
            code: i.code,
            title: i.title,
            requiredLevel: i.requiredLevel,
            status,
            lastOutcome: l?.outcome ?? null,
            lastCheckedOn: l?.on ?? null,
            signedOn: so?.signedOn ?? null,
            signerName: so?.signerName ?? null,
          };
        }),
    })),
    ground,
    checks: access === "sponsor" ? checks.map((c) => ({ ...c, questions: [], remarks: undefined })) : checks,
    chart: [...chartMap.entries()].sort(([a], [b]) => a.localeCompare(b)).map(([date, v]) => ({ date, ...v })),
  };
}

/** Students whose Progress map the viewer may open (for the picker). */
export async function progressStudentsFor(viewer: CurrentUser): Promise<{ id: string; name: string; cohortName: string | null }[]> {
  const rows = await sequelize.query<{ id: string; name: string; cohortName: string | null }>(
    `SELECT p.id, p.name, c.name AS "cohortName" FROM people p
       JOIN enrolments e ON e.student_id = p.id AND e.status = 'active'
       LEFT JOIN cohort_memberships m ON m.student_id = p.id AND m.to_date IS NULL LEFT JOIN cohorts c ON c.id = m.cohort_id
      WHERE p.school_id = :schoolId AND p.active ORDER BY c.name NULLS LAST, p.name`,
    { replacements: { schoolId: viewer.schoolId }, type: QueryTypes.SELECT },
  );
  if (viewer.roles.includes("chief")) return rows;
  const allowed = new Set<string>();
  if (viewer.roles.includes("instructor")) for (const id of await instructorStudentIds(viewer)) allowed.add(id);
  if (viewer.roles.includes("student")) allowed.add(viewer.id);
  if (viewer.roles.includes("sponsor")) {
    const links = await sequelize.query<{ id: string }>(
      `SELECT student_id AS id FROM sponsor_links WHERE sponsor_id = :s AND shares_progress`,
      { replacements: { s: viewer.id }, type: QueryTypes.SELECT },
    );
    for (const l of links) allowed.add(l.id);
  }
  return rows.filter((r) => allowed.has(r.id));
}

// ---------------------------------------------------------------- register and watch notes

export type WatchNoteKind =
  | "signed_before_check"
  | "signer_not_current"
  | "examiner_was_lead"
  | "missed_session"
  | "late_entry"
  | "repeated_not_yet"
  | "amended"
  | "withdrawn";

export const WATCH_NOTE_LABEL: Record<WatchNoteKind, string> = {
  signed_before_check: "Signed before its check",
  signer_not_current: "Signer not qualified or not current",
  examiner_was_lead: "Examiner was the lead instructor",
  missed_session: "Covering session missed, no make-up",
  late_entry: "Entered late",
  repeated_not_yet: "Repeated Not yet",
  amended: "Amended",
  withdrawn: "Withdrawn",
};

export interface WatchNote {
  kind: WatchNoteKind;
  label: string;
  detail: string;
  recordType: "sign_off" | "oral_check" | "stage_check";
  recordId: string;
  studentId: string;
  studentName: string;
  itemCode: string | null;
  at: Date;
}

export interface RegisterRow {
  kind: "sign_off" | "stage_check";
  id: string;
  studentId: string;
  studentName: string;
  cohortId: string | null;
  cohortName: string | null;
  stageId: string;
  stageCode: string;
  itemCode: string | null;
  itemTitle: string | null;
  signerId: string;
  signerName: string;
  date: string;
  recordedAt: Date;
  basis: string;
  state: "current" | "withdrawn" | "amended" | "pass" | "fail";
  reason: string | null;
  signatureHash: string;
  notes: WatchNote[];
}

export interface RegisterFilter {
  instructorId?: string | undefined;
  cohortId?: string | undefined;
  stageId?: string | undefined;
  from?: string | undefined;
  to?: string | undefined;
}

interface SignOffRow {
  id: string;
  student_id: string;
  student_name: string;
  cohort_id: string | null;
  cohort_name: string | null;
  stage_id: string;
  stage_code: string;
  item_id: string;
  item_code: string;
  item_title: string;
  course_id: string;
  signer_id: string;
  signer_name: string;
  signed_on: string;
  signed_at: Date;
  check_at: Date;
  check_level: string;
  check_outcome: CheckOutcome;
  amends_id: string | null;
  amend_reason: string | null;
  withdraw_reason: string | null;
  amended_by: string | null;
  signature_hash: string;
}

/** The register's rows (sign-offs and stage checks) and every watch note of the school. */
export async function signOffRegister(
  user: CurrentUser,
  filter: RegisterFilter = {},
): Promise<{ rows: RegisterRow[]; notes: WatchNote[] }> {
  const school = await schoolFor(user.schoolId);
  const tz = school.timeZone;
  const signOffs = await sequelize.query<SignOffRow>(
    `SELECT s.id, s.student_id, st.name AS student_name, c.id AS cohort_id, c.name AS cohort_name, g.id AS stage_id, g.code AS stage_code,
            i.id AS item_id, i.code AS item_code, i.title AS item_title, e.course_id, s.signer_id, sp.name AS signer_name, s.signed_on, s.signed_at,
            oc.occurred_at AS check_at, oc.level_shown AS check_level, oc.outcome AS check_outcome, s.amends_id, s.amend_reason,
            w.reason AS withdraw_reason, (SELECT a.id FROM sign_offs a WHERE a.amends_id = s.id) AS amended_by, s.signature_hash
       FROM sign_offs s
       JOIN people st ON st.id = s.student_id JOIN people sp ON sp.id = s.signer_id
       JOIN syllabus_items i ON i.id = s.syllabus_item_id JOIN syllabus_stages g ON g.id = i.stage_id
       JOIN enrolments e ON e.id = s.enrolment_id JOIN oral_checks oc ON oc.id = s.basis_check_id
       LEFT JOIN sign_off_withdrawals w ON w.sign_off_id = s.id
       LEFT JOIN cohort_memberships m ON m.student_id = s.student_id AND m.to_date IS NULL LEFT JOIN cohorts c ON c.id = m.cohort_id
      WHERE s.school_id = :schoolId ORDER BY s.signed_at DESC`,
    { replacements: { schoolId: user.schoolId }, type: QueryTypes.SELECT },
  );
  const stageChecks = await sequelize.query<{
    id: string;
    student_id: string;
    student_name: string;
    cohort_id: string | null;
    cohort_name: string | null;
    stage_id: string;
    stage_code: string;
    stage_title: string;
    examiner_id: string;
    examiner_name: string;
    lead_instructor_id: string | null;
    override_reason: string | null;
    result: "pass" | "fail";
    written_score_percent: string | null;
    pass_mark_percent: string;
    occurred_at: Date;
    recorded_at: Date;
    attempt: number;
    signature_hash: string;
    oral_outcomes: { code?: string; outcome: QuestionOutcome }[];
  }>(
    `SELECT s.id, s.student_id, st.name AS student_name, c.id AS cohort_id, c.name AS cohort_name, g.id AS stage_id, g.code AS stage_code, g.title AS stage_title,
            s.examiner_id, ep.name AS examiner_name, s.lead_instructor_id, s.override_reason, s.result, s.written_score_percent, s.pass_mark_percent,
            s.occurred_at, s.recorded_at, s.attempt, s.signature_hash, s.oral_outcomes
       FROM stage_checks s JOIN people st ON st.id = s.student_id JOIN people ep ON ep.id = s.examiner_id JOIN syllabus_stages g ON g.id = s.stage_id
       LEFT JOIN cohort_memberships m ON m.student_id = s.student_id AND m.to_date IS NULL LEFT JOIN cohorts c ON c.id = m.cohort_id
      WHERE s.school_id = :schoolId ORDER BY s.recorded_at DESC`,
    { replacements: { schoolId: user.schoolId }, type: QueryTypes.SELECT },
  );
  const checks = await sequelize.query<{
    id: string;
    student_id: string;
    student_name: string;
    occurred_at: Date;
    recorded_at: Date;
    amends_id: string | null;
    amend_reason: string | null;
    withdraw_reason: string | null;
    withdrawn_at: Date | null;
    not_yet_items: string[] | null;
  }>(
    `SELECT c.id, c.student_id, st.name AS student_name, c.occurred_at, c.recorded_at, c.amends_id, c.amend_reason, w.reason AS withdraw_reason, w.withdrawn_at,
            (SELECT array_agg(DISTINCT q.item_code) FROM oral_check_questions q WHERE q.check_id = c.id AND q.outcome = 'not_yet') AS not_yet_items
       FROM oral_checks c JOIN people st ON st.id = c.student_id LEFT JOIN oral_check_withdrawals w ON w.check_id = c.id
      WHERE c.school_id = :schoolId ORDER BY c.occurred_at`,
    { replacements: { schoolId: user.schoolId }, type: QueryTypes.SELECT },
  );

  const notes: WatchNote[] = [];
  const lateDays = school.settings.lateEntryDays;
  const note = (n: Omit<WatchNote, "label">) => notes.push({ ...n, label: WATCH_NOTE_LABEL[n.kind] });

  // covering sessions missed without a make-up (when the Ground log exists)
  const missed = new Set<string>();
  if ((await tableExists("ground_log_current")) && (await tableExists("makeup_items"))) {
    const rows = await sequelize.query<{ student_id: string; item_id: string }>(
      `SELECT DISTINCT g.student_id, x.item_id FROM ground_log_current g CROSS JOIN LATERAL unnest(g.syllabus_item_ids) AS x(item_id)
        WHERE g.school_id = :schoolId AND g.status IN ('absent','absent_excused')
          AND NOT EXISTS (SELECT 1 FROM makeup_items mi WHERE mi.student_id = g.student_id AND mi.syllabus_item_id = x.item_id AND mi.state = 'done')`,
      { replacements: { schoolId: user.schoolId }, type: QueryTypes.SELECT },
    );
    for (const r of rows) missed.add(`${r.student_id}:${r.item_id}`);
  }

  const standingCache = new Map<string, Awaited<ReturnType<typeof signerStanding>>>();
  for (const s of signOffs) {
    const base = {
      recordType: "sign_off" as const,
      recordId: s.id,
      studentId: s.student_id,
      studentName: s.student_name,
      itemCode: s.item_code,
      at: s.signed_at,
    };
    const checkDate = dateInZone(s.check_at, tz);
    if (s.signed_on < checkDate)
      note({ ...base, kind: "signed_before_check", detail: `signed for ${s.signed_on}, its check is of ${checkDate}` });
    const key = `${s.signer_id}:${s.course_id}:${s.signed_on}`;
    if (!standingCache.has(key)) standingCache.set(key, await signerStanding(s.signer_id, s.course_id, s.signed_on));
    const st = standingCache.get(key)!;
    if (!st.qualified || !st.current)
      note({
        ...base,
        kind: "signer_not_current",
        detail: `${s.signer_name} was ${!st.qualified ? "not qualified for the course" : "not current"} on ${s.signed_on}`,
      });
    if (missed.has(`${s.student_id}:${s.item_id}`))
      note({
        ...base,
        kind: "missed_session",
        detail: `${s.student_name} missed a session covering ${s.item_code} and has no completed make-up`,
      });
    const lag = differenceInCalendarDays(s.signed_at, new Date(`${s.signed_on}T12:00:00Z`));
    if (lag > lateDays) note({ ...base, kind: "late_entry", detail: `entered ${lag} days after the date signed for (limit ${lateDays})` });
    if (s.amends_id) note({ ...base, kind: "amended", detail: `amends an earlier sign-off: ${s.amend_reason}` });
    if (s.withdraw_reason) note({ ...base, kind: "withdrawn", detail: `withdrawn: ${s.withdraw_reason}` });
  }
  for (const c of stageChecks) {
    const base = {
      recordType: "stage_check" as const,
      recordId: c.id,
      studentId: c.student_id,
      studentName: c.student_name,
      itemCode: null,
      at: c.recorded_at,
    };
    if (c.lead_instructor_id && c.lead_instructor_id === c.examiner_id)
      note({
        ...base,
        kind: "examiner_was_lead",
        detail: `${c.examiner_name} examined their own student: ${c.override_reason ?? "no reason"}`,
      });
    const lag = differenceInCalendarDays(c.recorded_at, c.occurred_at);
    if (lag > lateDays) note({ ...base, kind: "late_entry", detail: `entered ${lag} days after the stage check (limit ${lateDays})` });
  }
  const notYetCount = new Map<string, { n: number; last: (typeof checks)[number] }>();
  for (const c of checks) {
    const base = {
      recordType: "oral_check" as const,
      recordId: c.id,
      studentId: c.student_id,
      studentName: c.student_name,
      itemCode: null,
      at: c.recorded_at,
    };
    const lag = differenceInCalendarDays(c.recorded_at, c.occurred_at);
    if (lag > lateDays)
      note({ ...base, kind: "late_entry", detail: `oral check entered ${lag} days after it happened (limit ${lateDays})` });
    if (c.amends_id) note({ ...base, kind: "amended", detail: `oral check amended: ${c.amend_reason}` });
    if (c.withdraw_reason)
      note({ ...base, kind: "withdrawn", detail: `oral check withdrawn: ${c.withdraw_reason}`, at: c.withdrawn_at ?? c.recorded_at });
    if (c.withdraw_reason) continue;
    for (const code of c.not_yet_items ?? []) {
      const k = `${c.student_id}:${code}`;
      const e = notYetCount.get(k) ?? { n: 0, last: c };
      notYetCount.set(k, { n: e.n + 1, last: c });
    }
  }
  for (const [k, v] of notYetCount) {
    if (v.n < 2) continue;
    const code = k.split(":")[1]!;
    note({
      recordType: "oral_check",
      recordId: v.last.id,
      studentId: v.last.student_id,
      studentName: v.last.student_name,
      itemCode: code,
      at: v.last.recorded_at,
      kind: "repeated_not_yet",
      detail: `${v.n} oral checks with Not yet on ${code}`,
    });
  }

  const notesFor = (id: string) => notes.filter((n) => n.recordId === id);
  let rows: RegisterRow[] = [
    ...signOffs.map((s): RegisterRow => ({
      kind: "sign_off",
      id: s.id,
      studentId: s.student_id,
      studentName: s.student_name,
      cohortId: s.cohort_id,
      cohortName: s.cohort_name,
      stageId: s.stage_id,
      stageCode: s.stage_code,
      itemCode: s.item_code,
      itemTitle: s.item_title,
      signerId: s.signer_id,
      signerName: s.signer_name,
      date: s.signed_on,
      recordedAt: s.signed_at,
      basis: `Oral check of ${dateInZone(s.check_at, tz)}: ${s.check_outcome === "meets" ? "meets the standard" : "Not yet"}, level ${s.check_level}`,
      state: s.withdraw_reason ? "withdrawn" : s.amended_by ? "amended" : "current",
      reason: s.withdraw_reason ?? s.amend_reason,
      signatureHash: s.signature_hash,
      notes: notesFor(s.id),
    })),
    ...stageChecks.map((c): RegisterRow => ({
      kind: "stage_check",
      id: c.id,
      studentId: c.student_id,
      studentName: c.student_name,
      cohortId: c.cohort_id,
      cohortName: c.cohort_name,
      stageId: c.stage_id,
      stageCode: c.stage_code,
      itemCode: null,
      itemTitle: `Stage check ${c.stage_code} (attempt ${c.attempt})`,
      signerId: c.examiner_id,
      signerName: c.examiner_name,
      date: dateInZone(c.occurred_at, tz),
      recordedAt: c.recorded_at,
      basis: `Oral: ${c.oral_outcomes.map((o) => `${o.code ?? "?"} ${o.outcome === "solid" ? "Solid" : o.outcome === "shaky" ? "Shaky" : "Not yet"}`).join(", ") || "—"}; written ${c.written_score_percent === null ? "not set" : `${Number(c.written_score_percent)} % (pass mark ${Number(c.pass_mark_percent)} %)`}`,
      state: c.result,
      reason: c.override_reason,
      signatureHash: c.signature_hash,
      notes: notesFor(c.id),
    })),
  ];
  rows = rows.filter(
    (r) =>
      (!filter.instructorId || r.signerId === filter.instructorId) &&
      (!filter.cohortId || r.cohortId === filter.cohortId) &&
      (!filter.stageId || r.stageId === filter.stageId) &&
      (!filter.from || r.date >= filter.from) &&
      (!filter.to || r.date <= filter.to),
  );
  rows.sort((a, b) => b.date.localeCompare(a.date) || b.recordedAt.getTime() - a.recordedAt.getTime());
  notes.sort((a, b) => b.at.getTime() - a.at.getTime());
  return { rows, notes };
}

/** The register's filter choices. */
export async function registerFilterOptions(schoolId: string) {
  const instructors = await sequelize.query<{ id: string; name: string }>(
    `SELECT id, name FROM people WHERE school_id = :schoolId AND roles && ARRAY['instructor','chief']::text[] ORDER BY name`,
    { replacements: { schoolId }, type: QueryTypes.SELECT },
  );
  const cohorts = await sequelize.query<{ id: string; name: string }>(
    `SELECT id, name FROM cohorts WHERE school_id = :schoolId ORDER BY name`,
    { replacements: { schoolId }, type: QueryTypes.SELECT },
  );
  const stages = await sequelize.query<{ id: string; label: string }>(
    `SELECT g.id, co.code || ' r' || r.number || ' · ' || g.code || ' ' || g.title AS label
       FROM syllabus_stages g JOIN syllabus_revisions r ON r.id = g.revision_id JOIN courses co ON co.id = r.course_id
      WHERE co.school_id = :schoolId ORDER BY co.code, r.number, g.position`,
    { replacements: { schoolId }, type: QueryTypes.SELECT },
  );
  return { instructors, cohorts, stages };
}

/** The chief's Today: stage checks waiting (and since when), watch notes, the chain's status. */
export async function chiefRecordsSummary(user: CurrentUser) {
  const students = await progressStudentsFor(user);
  const waiting: { studentId: string; studentName: string; stageCode: string; since: Date | null; days: number | null }[] = [];
  for (const st of students) {
    const { student } = await requireStudentFor(user, st.id, "staff");
    for (const s of await stageReadiness(student)) {
      if (s.ready)
        waiting.push({
          studentId: st.id,
          studentName: st.name,
          stageCode: s.code,
          since: s.readySince,
          days: s.readySince ? differenceInCalendarDays(now(), s.readySince) : null,
        });
    }
  }
  waiting.sort((a, b) => (b.days ?? 0) - (a.days ?? 0));
  const { notes } = await signOffRegister(user);
  const chain = await verifyChain(user.schoolId);
  return { waiting, notes, chain };
}

export interface TrainingRecord {
  school: { name: string; timeZone: string };
  student: StudentRef;
  groundMinutes: number;
  groundLog: { date: string; title: string; status: string; minutes: number }[];
  checks: CheckSummary[];
  signOffs: {
    itemCode: string;
    itemTitle: string;
    signedOn: string;
    signerName: string;
    state: string;
    reason: string | null;
    signatureHash: string;
  }[];
  stageChecks: { stageCode: string; attempt: number; result: string; date: string; examinerName: string; written: string | null }[];
  head: { hash: string; position: number };
  generatedAt: Date;
}

/** Everything the printable training record shows (staff or the student themself). */
export async function trainingRecordFor(viewer: CurrentUser, studentId: string): Promise<TrainingRecord> {
  const { student, access } = await requireStudentFor(viewer, studentId, "view");
  if (access === "sponsor") throw new HttpError(404, "studentId: no such student", "studentId");
  const school = await schoolFor(viewer.schoolId);
  let groundLog: TrainingRecord["groundLog"] = [];
  if (await tableExists("ground_log_current")) {
    groundLog = (
      await sequelize.query<{ occurred_at: Date; title: string | null; status: string; credited_minutes: number }>(
        `SELECT g.occurred_at, br.title, g.status, g.credited_minutes FROM ground_log_current g
           LEFT JOIN briefing_revisions br ON br.id = g.briefing_revision_id
          WHERE g.student_id = :st AND g.course_id = :course ORDER BY g.occurred_at`,
        { replacements: { st: student.id, course: student.courseId }, type: QueryTypes.SELECT },
      )
    ).map((r) => ({
      date: dateInZone(r.occurred_at, school.timeZone),
      title: r.title ?? "Session",
      status: r.status,
      minutes: r.credited_minutes,
    }));
  }
  const { rows } = await signOffRegister({ ...viewer, roles: ["chief"] });
  const mine = rows.filter((r) => r.studentId === student.id);
  return {
    school: { name: school.name, timeZone: school.timeZone },
    student,
    groundMinutes: await creditedMinutesFor(student.id, student.courseId),
    groundLog,
    checks: await listChecksOfStudent(viewer.schoolId, student.id, { withRemarks: false }),
    signOffs: mine
      .filter((r) => r.kind === "sign_off")
      .map((r) => ({
        itemCode: r.itemCode ?? "",
        itemTitle: r.itemTitle ?? "",
        signedOn: r.date,
        signerName: r.signerName,
        state: r.state,
        reason: r.reason,
        signatureHash: r.signatureHash,
      })),
    stageChecks: mine
      .filter((r) => r.kind === "stage_check")
      .map((r) => ({ stageCode: r.stageCode, attempt: 0, result: r.state, date: r.date, examinerName: r.signerName, written: r.basis })),
    head: await chainHead(viewer.schoolId),
    generatedAt: now(),
  };
}
