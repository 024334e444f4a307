import "server-only";
import { randomUUID } from "node:crypto";
import { QueryTypes, type Transaction } from "sequelize";
import { sequelize } from "../../index";
import type { CurrentUser } from "@/lib/auth/session";
import { HttpError } from "@/lib/http/errors";
import { now } from "@/lib/clock";
import { generateQuestion, QuestionInputError, toleranceText, type GeneratedQuestion } from "@/lib/records/questions";
import { practiceTestResult, scorePractice } from "@/lib/practice/generate";
import type { PracticeAnswer } from "@/lib/practice/schema";
import { getSchool, DEFAULT_SETTINGS } from "../shared/school";
import { practiceTopicsFor } from "./topics";

// Storing practice: the question is computed again on the server from the student's own demo and
// the inputs shown (never from the browser's answer), scored, and kept in practice_attempts only.

export interface ScoredAttempt {
  id: string;
  correct: boolean;
  question: string;
  worked: string;
  tolerance: string;
}

async function scoreOne(
  caller: CurrentUser,
  a: PracticeAnswer,
  testId: string | null,
  index: number,
  t: Transaction,
): Promise<ScoredAttempt> {
  const at = (field: string) => (testId ? `answers.${index}.${field}` : field);
  const topics = await practiceTopicsFor(caller.schoolId, caller.id);
  const topic = topics.find((x) => x.demoRevisionId === a.demoRevisionId);
  if (!topic) throw new HttpError(404, `${at("demoRevisionId")}: no such demo among your assignments`, at("demoRevisionId"));
  if (a.itemId !== null && !topic.items.some((i) => i.id === a.itemId))
    throw new HttpError(400, `${at("itemId")}: this demo does not teach that syllabus item`, at("itemId"));
  let q: GeneratedQuestion;
  try {
    q = generateQuestion(a.kind, topic.snapshot, a.inputs, { answerMode: "exact" });
  } catch (e) {
    if (e instanceof QuestionInputError) throw new HttpError(400, `${at(`inputs.${e.field}`)}: ${e.detail}`, at(`inputs.${e.field}`));
    throw e;
  }
  const given = a.choice !== undefined ? { choice: a.choice } : { figure: a.figure ?? Number.NaN };
  if (q.answer.type === "choice" && a.choice === undefined)
    throw new HttpError(400, `${at("choice")}: choose stable or unstable`, at("choice"));
  if (q.answer.type === "number" && a.figure === undefined) throw new HttpError(400, `${at("figure")}: enter a number`, at("figure"));
  const correct = scorePractice(q, given);
  const [row] = await sequelize.query<{ id: string }>(
    `INSERT INTO practice_attempts (school_id, student_id, syllabus_item_id, demo_revision_id, test_id, kind, question, given, correct, answered_at)
     VALUES (:schoolId, :studentId, :itemId, :demoRevisionId, :testId, :kind, CAST(:question AS jsonb), CAST(:given AS jsonb), :correct, :at) RETURNING id`,
    {
      replacements: {
        schoolId: caller.schoolId,
        studentId: caller.id,
        itemId: a.itemId,
        demoRevisionId: a.demoRevisionId,
        testId,
        kind: a.kind,
        question: JSON.stringify(q),
        given: JSON.stringify(given),
        correct,
        at: now(),
      },
      type: QueryTypes.SELECT,
      transaction: t,
    },
  );
  return { id: row!.id, correct, question: q.text, worked: q.answer.display, tolerance: toleranceText(q) };
}

/** One practice question answered: scored at once, the worked answer returned. */
export async function answerPractice(caller: CurrentUser, a: PracticeAnswer, t: Transaction): Promise<ScoredAttempt> {
  return scoreOne(caller, a, null, 0, t);
}

/** A practice test: every answer scored, the share correct against the school's pass mark. */
export async function submitPracticeTest(caller: CurrentUser, answers: PracticeAnswer[], t: Transaction) {
  const testId = randomUUID();
  const scored: ScoredAttempt[] = [];
  for (const [i, a] of answers.entries()) scored.push(await scoreOne(caller, a, testId, i, t));
  const school = await getSchool(caller.schoolId, t);
  const passMark = school.settings.stageCheckPassMarkPercent ?? DEFAULT_SETTINGS.stageCheckPassMarkPercent;
  return { testId, scored, result: practiceTestResult(scored.filter((s) => s.correct).length, scored.length, passMark) };
}

export interface PracticeHistoryRow {
  answeredAt: Date;
  question: string;
  correct: boolean;
  worked: string;
  testId: string | null;
}

/** The student's own recent practice, newest first. */
export async function practiceHistoryOf(caller: CurrentUser, limit = 20): Promise<PracticeHistoryRow[]> {
  return sequelize.query<PracticeHistoryRow>(
    `SELECT answered_at AS "answeredAt", question->>'text' AS question, correct, question->'answer'->>'display' AS worked, test_id AS "testId"
       FROM practice_attempts WHERE school_id = :schoolId AND student_id = :studentId ORDER BY answered_at DESC LIMIT :limit`,
    { replacements: { schoolId: caller.schoolId, studentId: caller.id, limit }, type: QueryTypes.SELECT },
  );
}
