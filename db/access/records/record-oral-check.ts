import "server-only";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
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
  type AircraftSourceKind,
  type AnswerMode,
  type AircraftSnapshot,
  type GeneratedQuestion,
  type QuestionInputs,
  type QuestionKind,
} from "@/lib/records/questions";
import { isAeroInputError } from "@/lib/aero";
import { requireStudentFor } from "../shared/student-scope";
import { getSchool } from "../shared/school";
import { enqueueMail } from "../mail/outbox";
import { writeAudit } from "./audit-chain";
import { refuseUnlessStanding } from "./signer-standing";
import { itemsOfRevision, assertStageOpen, type ItemRef } from "./items";
import { listQuestionAircraft, recentSessionsOf } from "./question-aircraft";

// Recording an oral check (or its amendment): the check, its questions, the audit event and
// the Not yet mail, in the caller's transaction.

export interface QuestionInput {
  syllabusItemId: string;
  questionText?: string | undefined;
  answerSummary: string;
  outcome: QuestionOutcome;
  required: boolean;
  prompted: boolean;
  correctiveGiven: boolean;
  generated?:
    | {
        kind: QuestionKind;
        aircraft: { kind: AircraftSourceKind; id: string };
        inputs: QuestionInputs;
        answerMode?: AnswerMode | undefined;
      }
    | undefined;
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

function buildGenerated(q: NonNullable<QuestionInput["generated"]>, aircraft: AircraftSnapshot[], field: string): GeneratedQuestion {
  const snapshot = aircraft.find((a) => a.source.kind === q.aircraft.kind && a.source.id === q.aircraft.id);
  if (!snapshot) throw new HttpError(400, `${field}.aircraft: no such aircraft`, `${field}.aircraft`);
  try {
    return generateQuestion(q.kind, snapshot, q.inputs, { answerMode: q.answerMode });
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
  /** make-up items this check closed (items meeting the standard) */
  makeupItemsClosed: string[];
}

/**
 * Records an oral check with its questions in the caller's transaction, writes the audit
 * event, and queues the Not yet mail to the student when any answer was Not yet.
 */
export async function recordOralCheck(t: Transaction, user: CurrentUser, input: OralCheckInput): Promise<RecordedCheck> {
  const { student } = await requireStudentFor(user, input.studentId, "records", t);
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
  const checkedOn = dateInZone(input.occurredAt, (await getSchool(user.schoolId, t)).timeZone);
  await refuseUnlessStanding(user.id, student, checkedOn, "record oral checks", t);

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
  // A check meeting the standard on an item closes that item's make-up items that were open
  // when the check happened (opened at or before it), in this transaction, linked to the check.
  const meeting = evaluation.items.filter((i) => i.meets).map((i) => i.itemId);
  const closed = meeting.length
    ? await sequelize.query<{ id: string }>(
        `UPDATE makeup_items SET state = 'done', closed_by_kind = 'oral_check', closed_by_id = :check, closed_at = :at, scheduled_session_id = NULL
          WHERE student_id = :studentId AND syllabus_item_id IN (:items) AND state IN ('open','scheduled') AND created_at <= :occurredAt
          RETURNING id`,
        {
          replacements: { check: check.id, at, studentId: student.id, items: meeting, occurredAt: input.occurredAt },
          type: QueryTypes.SELECT,
          transaction: t,
        },
      )
    : [];
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
      ...(closed.length ? { makeupItemsClosed: closed.map((c) => c.id) } : {}),
    },
    occurredAt: at,
  });

  const notYetCodes = [...new Set(questions.filter((q) => q.outcome === "not_yet").map((q) => q.item.code))];
  let notYetMailed = false;
  if (notYetCodes.length > 0) {
    const school = await getSchool(user.schoolId, t);
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
  return { id: check.id, outcome: evaluation.outcome, items: evaluation.items, notYetMailed, makeupItemsClosed: closed.map((c) => c.id) };
}
