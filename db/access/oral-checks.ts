import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../index";
import type { CurrentUser } from "@/lib/auth/session";
import { HttpError } from "@/lib/http/errors";
import { now } from "@/lib/clock";
import { dateInZone } from "@/lib/time";
import { composeMail } from "@/lib/mail/compose";
import {
  evaluateCheck,
  DEFAULT_OUTCOME_RULE,
  type LevelOfLearning,
  type QuestionOutcome,
  type CheckOutcome,
  type ItemOutcome,
} from "@/lib/records/outcome";
import {
  generateQuestion,
  QuestionInputError,
  REFERENCE_AIRCRAFT,
  type AircraftSourceKind,
  type AircraftSnapshot,
  type GeneratedQuestion,
  type QuestionInputs,
  type QuestionKind,
} from "@/lib/records/questions";
import { isAeroInputError } from "@/lib/aero";
import { writeAudit } from "./audit";
import { enqueueMail } from "./outbox";
import { requireStudentFor, itemsOfRevision, assertStageOpen, tableExists, type ItemRef, schoolFor } from "./records";

export interface QuestionInput {
  syllabusItemId: string;
  questionText?: string | undefined;
  answerSummary: string;
  outcome: QuestionOutcome;
  required: boolean;
  prompted: boolean;
  correctiveGiven: boolean;
  generated?: { kind: QuestionKind; aircraft: { kind: AircraftSourceKind; id: string }; inputs: QuestionInputs } | undefined;
  studentFigure?: number | null | undefined;
}

export interface OralCheckInput {
  studentId: string;
  itemIds: string[];
  sessionId?: string | null | undefined;
  levelShown: LevelOfLearning;
  remarks: string;
  durationMinutes: number;
  occurredAt: Date;
  questions: QuestionInput[];
  amends?: { checkId: string; reason: string } | undefined;
}

interface DemoAirframe {
  name: string;
  maxMassKg: number;
  wingAreaM2: number;
  wingSpanM: number;
  oswaldEfficiency: number;
  zeroLiftDragCoefficient: number;
  configurations?: { clean?: { maxLiftCoefficient?: number } };
}

/**
 * Aircraft a question may be generated for: first the aircraft of the demos used in the
 * briefings of the student's recent sessions (frozen in the demo revision), then the school's
 * airframes (Curve Lab), then the reference aircraft.
 */
export async function listQuestionAircraft(schoolId: string, t?: Transaction, studentId?: string): Promise<AircraftSnapshot[]> {
  const out: AircraftSnapshot[] = [];
  if (studentId && (await tableExists("briefing_revision_demos", t)) && (await tableExists("session_attendees", t))) {
    const demos = await sequelize.query<{ id: string; demo_name: string; title: string; airframe: DemoAirframe | null }>(
      `SELECT DISTINCT ON (dr.id) dr.id, d.name AS demo_name, br.title, dr.spec->'airframe' AS airframe
         FROM session_attendees a JOIN training_sessions s ON s.id = a.session_id
         JOIN briefing_revisions br ON br.id = s.briefing_revision_id
         JOIN briefing_revision_demos bd ON bd.briefing_revision_id = s.briefing_revision_id
         JOIN demo_revisions dr ON dr.id = bd.demo_revision_id JOIN demos d ON d.id = dr.demo_id
        WHERE a.student_id = :studentId AND s.school_id = :schoolId AND s.status = 'scheduled' AND s.starts_at > CAST(:now AS timestamptz) - interval '90 days'
        ORDER BY dr.id, s.starts_at DESC`,
      { replacements: { studentId, schoolId, now: now() }, type: QueryTypes.SELECT, transaction: t },
    );
    for (const d of demos) {
      const a = d.airframe;
      if (!a || typeof a.wingAreaM2 !== "number") continue;
      out.push({
        name: `${a.name}, demo "${d.demo_name}" in ${d.title}`,
        source: { kind: "demo", id: d.id },
        aircraft: {
          massKg: a.maxMassKg,
          wingAreaM2: a.wingAreaM2,
          wingSpanM: a.wingSpanM,
          zeroLiftDragCoefficient: a.zeroLiftDragCoefficient,
          oswaldEfficiency: a.oswaldEfficiency,
          maxLiftCoefficient: a.configurations?.clean?.maxLiftCoefficient ?? 1.4,
        },
      });
    }
  }
  if (await tableExists("airframes", t)) {
    const rows = await sequelize.query<{
      id: string;
      name: string;
      max_mass_kg: number;
      wing_area_m2: number;
      wing_span_m: number;
      oswald_efficiency: number;
      zero_lift_drag_coefficient: number;
      configurations: { clean?: { cd0Increment?: number; maxLiftCoefficient?: number } };
    }>(`SELECT * FROM airframes WHERE school_id = :schoolId ${await hasRetired(t)} ORDER BY name`, {
      replacements: { schoolId },
      type: QueryTypes.SELECT,
      transaction: t,
    });
    for (const r of rows) {
      out.push({
        name: r.name,
        source: { kind: "airframe", id: r.id },
        aircraft: {
          massKg: r.max_mass_kg,
          wingAreaM2: r.wing_area_m2,
          wingSpanM: r.wing_span_m,
          zeroLiftDragCoefficient: r.zero_lift_drag_coefficient + (r.configurations?.clean?.cd0Increment ?? 0),
          oswaldEfficiency: r.oswald_efficiency,
          maxLiftCoefficient: r.configurations?.clean?.maxLiftCoefficient ?? 1.4,
        },
      });
    }
  }
  return [...out, ...REFERENCE_AIRCRAFT];
}

/** Sessions of the student in the last 90 days that have started, newest first (for the optional session link). */
export async function recentSessionsOf(
  studentId: string,
  schoolId: string,
  t?: Transaction,
): Promise<{ id: string; startsAt: Date; title: string }[]> {
  if (!(await tableExists("session_attendees", t))) return [];
  return sequelize.query<{ id: string; startsAt: Date; title: string }>(
    `SELECT s.id, s.starts_at AS "startsAt", br.title FROM session_attendees a JOIN training_sessions s ON s.id = a.session_id
       JOIN briefing_revisions br ON br.id = s.briefing_revision_id
      WHERE a.student_id = :studentId AND s.school_id = :schoolId AND s.status = 'scheduled'
        AND s.starts_at <= CAST(:now AS timestamptz) AND s.starts_at > CAST(:now AS timestamptz) - interval '90 days'
      ORDER BY s.starts_at DESC LIMIT 20`,
    { replacements: { studentId, schoolId, now: now() }, type: QueryTypes.SELECT, transaction: t },
  );
}

async function hasRetired(t?: Transaction): Promise<string> {
  const [r] = await sequelize.query<{ ok: boolean }>(
    `SELECT EXISTS (SELECT 1 FROM information_schema.columns WHERE table_name = 'airframes' AND column_name = 'retired_at') AS ok`,
    { type: QueryTypes.SELECT, transaction: t },
  );
  return r?.ok ? "AND retired_at IS NULL" : "";
}

function buildGenerated(q: NonNullable<QuestionInput["generated"]>, aircraft: AircraftSnapshot[], field: string): GeneratedQuestion {
  const snapshot = aircraft.find((a) => a.source.kind === q.aircraft.kind && a.source.id === q.aircraft.id);
  if (!snapshot) throw new HttpError(400, `${field}.aircraft: no such aircraft`, `${field}.aircraft`);
  try {
    return generateQuestion(q.kind, snapshot, q.inputs);
  } catch (e) {
    if (e instanceof QuestionInputError) throw new HttpError(400, `${field}.inputs.${e.message}`, `${field}.inputs.${e.field}`);
    if (isAeroInputError(e)) throw new HttpError(400, `${field}.inputs: ${e.message}`, `${field}.inputs`);
    throw e;
  }
}

export interface RecordedCheck {
  id: string;
  outcome: CheckOutcome;
  items: ItemOutcome[];
  notYetMailed: boolean;
}

/**
 * Records an oral check with its questions in the caller's transaction, writes the audit
 * event, and queues the Not yet mail to the student when any answer was Not yet.
 */
export async function recordOralCheck(t: Transaction, user: CurrentUser, input: OralCheckInput): Promise<RecordedCheck> {
  const { student } = await requireStudentFor(user, input.studentId, "staff", t);
  const all = await itemsOfRevision(student.revisionId, t);
  const items: ItemRef[] = [];
  for (const id of new Set(input.itemIds)) {
    const item = all.find((i) => i.id === id);
    if (!item) throw new HttpError(400, "itemIds: an item is not in the student's syllabus revision", "itemIds");
    items.push(item);
  }
  if (items.length === 0) throw new HttpError(400, "itemIds: choose at least one syllabus item", "itemIds");
  await assertStageOpen(student, items, all, "itemIds", t);
  const at = now();
  if (input.occurredAt.getTime() > at.getTime() + 5 * 60_000) throw new HttpError(400, "occurredAt: cannot be in the future", "occurredAt");
  if (input.questions.length === 0) throw new HttpError(400, "questions: record at least one question", "questions");

  let amendsId: string | null = null;
  if (input.amends) {
    const [orig] = await sequelize.query<{ id: string; student_id: string; amended: boolean; withdrawn: boolean }>(
      `SELECT c.id, c.student_id, EXISTS (SELECT 1 FROM oral_checks a WHERE a.amends_id = c.id) AS amended,
              EXISTS (SELECT 1 FROM oral_check_withdrawals w WHERE w.check_id = c.id) AS withdrawn
         FROM oral_checks c WHERE c.id = :id AND c.school_id = :schoolId`,
      { replacements: { id: input.amends.checkId, schoolId: user.schoolId }, type: QueryTypes.SELECT, transaction: t },
    );
    if (!orig || orig.student_id !== student.id) throw new HttpError(404, "amends.checkId: no such check", "amends.checkId");
    if (orig.amended || orig.withdrawn)
      throw new HttpError(409, "amends.checkId: that check was already amended or withdrawn", "amends.checkId");
    amendsId = orig.id;
  }

  const aircraft = input.questions.some((q) => q.generated) ? await listQuestionAircraft(user.schoolId, t, student.id) : [];
  if (input.sessionId) {
    const sessions = await recentSessionsOf(student.id, user.schoolId, t);
    if (!sessions.some((s) => s.id === input.sessionId))
      throw new HttpError(400, "sessionId: not a session this student attended", "sessionId");
  }
  const questions = input.questions.map((q, i) => {
    const field = `questions.${i}`;
    const item = items.find((it) => it.id === q.syllabusItemId);
    if (!item)
      throw new HttpError(400, `${field}.syllabusItemId: the question's item is not one of the check's items`, `${field}.syllabusItemId`);
    const generated = q.generated ? buildGenerated(q.generated, aircraft, `${field}.generated`) : null;
    const text = generated ? generated.text : (q.questionText ?? "").trim();
    if (!text) throw new HttpError(400, `${field}.questionText: write the question as asked`, `${field}.questionText`);
    return { ...q, item, text, generated };
  });

  const evaluation = evaluateCheck({
    levelShown: input.levelShown,
    items: items.map((i) => ({ id: i.id, code: i.code, requiredLevel: i.requiredLevel })),
    questions: questions.map((q) => ({ syllabusItemId: q.syllabusItemId, outcome: q.outcome, required: q.required })),
  });

  const [check] = await sequelize.query<{ id: string }>(
    `INSERT INTO oral_checks (school_id, student_id, enrolment_id, instructor_id, session_id, level_shown, remarks, duration_minutes,
                              occurred_at, recorded_at, outcome, outcome_rule, item_outcomes, amends_id, amend_reason)
     VALUES (:schoolId, :studentId, :enrolmentId, :instructorId, :sessionId, :level, :remarks, :duration, :occurredAt, :recordedAt,
             :outcome, :rule::jsonb, :itemOutcomes::jsonb, :amendsId, :amendReason)
     RETURNING id`,
    {
      transaction: t,
      type: QueryTypes.SELECT,
      replacements: {
        schoolId: user.schoolId,
        studentId: student.id,
        enrolmentId: student.enrolmentId,
        instructorId: user.id,
        sessionId: input.sessionId ?? null,
        level: input.levelShown,
        remarks: input.remarks.trim(),
        duration: input.durationMinutes,
        occurredAt: input.occurredAt,
        recordedAt: at,
        outcome: evaluation.outcome,
        rule: JSON.stringify(DEFAULT_OUTCOME_RULE),
        itemOutcomes: JSON.stringify(evaluation.items),
        amendsId,
        amendReason: input.amends?.reason.trim() ?? null,
      },
    },
  );
  if (!check) throw new Error("check not written");
  for (const item of items) {
    await sequelize.query(`INSERT INTO oral_check_items (check_id, syllabus_item_id) VALUES (:c, :i)`, {
      replacements: { c: check.id, i: item.id },
      transaction: t,
    });
  }
  let pos = 0;
  for (const q of questions) {
    await sequelize.query(
      `INSERT INTO oral_check_questions (check_id, position, syllabus_item_id, item_code, question_text, answer_summary, outcome, required, prompted, corrective_given, generated, student_figure)
       VALUES (:c, :pos, :item, :code, :text, :answer, :outcome, :required, :prompted, :corrective, :generated::jsonb, :figure)`,
      {
        transaction: t,
        replacements: {
          c: check.id,
          pos: ++pos,
          item: q.item.id,
          code: q.item.code,
          text: q.text,
          answer: q.answerSummary.trim(),
          outcome: q.outcome,
          required: q.required,
          prompted: q.prompted,
          corrective: q.correctiveGiven,
          generated: q.generated ? JSON.stringify(q.generated) : null,
          figure: q.studentFigure ?? null,
        },
      },
    );
  }
  await writeAudit(t, {
    schoolId: user.schoolId,
    actor: user,
    action: amendsId ? "check.amended" : "check.recorded",
    recordType: "oral_check",
    recordId: check.id,
    before: amendsId ? { checkId: amendsId } : undefined,
    after: {
      studentId: student.id,
      itemCodes: items.map((i) => i.code),
      levelShown: input.levelShown,
      outcome: evaluation.outcome,
      occurredAt: input.occurredAt.toISOString(),
      questions: questions.map((q) => ({
        item: q.item.code,
        text: q.text,
        outcome: q.outcome,
        required: q.required,
        prompted: q.prompted,
        correctiveGiven: q.correctiveGiven,
        generated: q.generated ? { kind: q.generated.kind, answer: q.generated.answer.value } : null,
      })),
      ...(amendsId ? { amends: amendsId, reason: input.amends?.reason.trim() } : {}),
    },
    occurredAt: at,
  });

  const notYetCodes = [...new Set(questions.filter((q) => q.outcome === "not_yet").map((q) => q.item.code))];
  let notYetMailed = false;
  if (notYetCodes.length > 0) {
    const school = await schoolFor(user.schoolId, t);
    const mail = composeMail(
      "check.notyet",
      { name: student.name, itemCodes: notYetCodes, checkedOn: dateInZone(input.occurredAt, school.timeZone) },
      { name: school.name, timeZone: school.timeZone, senderName: school.settings.mailSenderName },
    );
    notYetMailed = await enqueueMail(t, {
      schoolId: user.schoolId,
      kind: "check.notyet",
      idempotencyKey: `check.notyet:${check.id}:${student.id}`,
      recipientId: student.id,
      to: student.email,
      ...mail,
    });
  }
  return { id: check.id, outcome: evaluation.outcome, items: evaluation.items, notYetMailed };
}

/** Withdraws an oral check (it stays visible, marked withdrawn, with the reason). */
export async function withdrawOralCheck(t: Transaction, user: CurrentUser, input: { checkId: string; reason: string }) {
  const [c] = await sequelize.query<{ id: string; student_id: string; instructor_id: string }>(
    `SELECT id, student_id, instructor_id FROM oral_checks WHERE id = :id AND school_id = :schoolId`,
    { replacements: { id: input.checkId, schoolId: user.schoolId }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!c) throw new HttpError(404, "checkId: no such check", "checkId");
  await requireStudentFor(user, c.student_id, "staff", t);
  if (!user.roles.includes("chief") && c.instructor_id !== user.id)
    throw new HttpError(403, "checkId: only the instructor who recorded the check, or the chief instructor, may withdraw it", "checkId");
  const at = now();
  const [row] = await sequelize.query<{ check_id: string }>(
    `INSERT INTO oral_check_withdrawals (check_id, withdrawn_by, reason, withdrawn_at) VALUES (:id, :by, :reason, :at)
     ON CONFLICT (check_id) DO NOTHING RETURNING check_id`,
    { replacements: { id: c.id, by: user.id, reason: input.reason.trim(), at }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!row) throw new HttpError(409, "checkId: the check is already withdrawn", "checkId");
  await writeAudit(t, {
    schoolId: user.schoolId,
    actor: user,
    action: "check.withdrawn",
    recordType: "oral_check",
    recordId: c.id,
    before: { state: "in force" },
    after: { state: "withdrawn", reason: input.reason.trim() },
    occurredAt: at,
  });
  return { checkId: c.id };
}

/** The student acknowledges the debrief of their own check (an acknowledgement, not consent). */
export async function acknowledgeOralCheck(t: Transaction, user: CurrentUser, checkId: string) {
  const [c] = await sequelize.query<{ id: string }>(
    `SELECT id FROM oral_checks WHERE id = :id AND school_id = :schoolId AND student_id = :me`,
    { replacements: { id: checkId, schoolId: user.schoolId, me: user.id }, type: QueryTypes.SELECT, transaction: t },
  );
  if (!c) throw new HttpError(404, "checkId: no such check", "checkId");
  const at = now();
  const [row] = await sequelize.query<{ check_id: string }>(
    `INSERT INTO oral_check_acknowledgements (check_id, student_id, acknowledged_at) VALUES (:id, :me, :at)
     ON CONFLICT (check_id) DO NOTHING RETURNING check_id`,
    { replacements: { id: c.id, me: user.id, at }, type: QueryTypes.SELECT, transaction: t },
  );
  if (row) {
    await writeAudit(t, {
      schoolId: user.schoolId,
      actor: user,
      action: "check.acknowledged",
      recordType: "oral_check",
      recordId: c.id,
      after: { acknowledgedAt: at.toISOString() },
      occurredAt: at,
    });
  }
  return { checkId: c.id, acknowledged: true, first: !!row };
}

export interface CheckSummary {
  id: string;
  occurredAt: Date;
  recordedAt: Date;
  instructorName: string;
  levelShown: LevelOfLearning;
  outcome: CheckOutcome;
  itemCodes: string[];
  itemOutcomes: ItemOutcome[];
  durationMinutes: number;
  withdrawn: { reason: string; at: Date; byName: string } | null;
  amendedBy: string | null;
  amends: { id: string; reason: string } | null;
  acknowledgedAt: Date | null;
  /** internal: only for staff */
  remarks?: string;
  questions: {
    position: number;
    itemCode: string;
    text: string;
    answerSummary: string;
    outcome: QuestionOutcome;
    required: boolean;
    prompted: boolean;
    correctiveGiven: boolean;
    generated: GeneratedQuestion | null;
    studentFigure: number | null;
  }[];
}

/** Checks of a student, newest first. Remarks only when `withRemarks` (staff). */
export async function listChecksOfStudent(
  schoolId: string,
  studentId: string,
  opts: { withRemarks: boolean; limit?: number },
): Promise<CheckSummary[]> {
  const rows = await sequelize.query<
    Omit<CheckSummary, "questions" | "withdrawn" | "amends"> & {
      remarks: string;
      w_reason: string | null;
      w_at: Date | null;
      w_by: string | null;
      amends_id: string | null;
      amend_reason: string | null;
    }
  >(
    `SELECT c.id, c.occurred_at AS "occurredAt", c.recorded_at AS "recordedAt", p.name AS "instructorName", c.level_shown AS "levelShown",
            c.outcome, c.item_outcomes AS "itemOutcomes", c.duration_minutes AS "durationMinutes", c.remarks,
            (SELECT array_agg(i.code ORDER BY i.code) FROM oral_check_items ci JOIN syllabus_items i ON i.id = ci.syllabus_item_id WHERE ci.check_id = c.id) AS "itemCodes",
            w.reason AS w_reason, w.withdrawn_at AS w_at, wp.name AS w_by,
            (SELECT a.id FROM oral_checks a WHERE a.amends_id = c.id) AS "amendedBy",
            c.amends_id, c.amend_reason, k.acknowledged_at AS "acknowledgedAt"
       FROM oral_checks c JOIN people p ON p.id = c.instructor_id
       LEFT JOIN oral_check_withdrawals w ON w.check_id = c.id LEFT JOIN people wp ON wp.id = w.withdrawn_by
       LEFT JOIN oral_check_acknowledgements k ON k.check_id = c.id
      WHERE c.school_id = :schoolId AND c.student_id = :studentId
      ORDER BY c.occurred_at DESC LIMIT :limit`,
    { replacements: { schoolId, studentId, limit: opts.limit ?? 200 }, type: QueryTypes.SELECT },
  );
  const ids = rows.map((r) => r.id);
  const qs = ids.length
    ? await sequelize.query<{
        check_id: string;
        position: number;
        item_code: string;
        question_text: string;
        answer_summary: string;
        outcome: QuestionOutcome;
        required: boolean;
        prompted: boolean;
        corrective_given: boolean;
        generated: GeneratedQuestion | null;
        student_figure: number | null;
      }>(`SELECT * FROM oral_check_questions WHERE check_id IN (:ids) ORDER BY check_id, position`, {
        replacements: { ids },
        type: QueryTypes.SELECT,
      })
    : [];
  return rows.map((r) => ({
    id: r.id,
    occurredAt: r.occurredAt,
    recordedAt: r.recordedAt,
    instructorName: r.instructorName,
    levelShown: r.levelShown,
    outcome: r.outcome,
    itemCodes: r.itemCodes ?? [],
    itemOutcomes: r.itemOutcomes,
    durationMinutes: r.durationMinutes,
    withdrawn: r.w_reason ? { reason: r.w_reason, at: r.w_at!, byName: r.w_by ?? "" } : null,
    amendedBy: r.amendedBy,
    amends: r.amends_id ? { id: r.amends_id, reason: r.amend_reason ?? "" } : null,
    acknowledgedAt: r.acknowledgedAt,
    ...(opts.withRemarks ? { remarks: r.remarks } : {}),
    questions: qs
      .filter((q) => q.check_id === r.id)
      .map((q) => ({
        position: q.position,
        itemCode: q.item_code,
        text: q.question_text,
        answerSummary: q.answer_summary,
        outcome: q.outcome,
        required: q.required,
        prompted: q.prompted,
        correctiveGiven: q.corrective_given,
        generated: q.generated,
        studentFigure: q.student_figure,
      })),
  }));
}
