"use server";
import { z } from "zod";
import { revalidatePath } from "next/cache";
import { runAction } from "@/lib/actions/run-action";
import { recordOralCheck, withdrawOralCheck } from "@/db/access/oral-checks";
import { signOff, withdrawSignOff, amendSignOff } from "@/db/access/sign-offs";
import { conductStageCheck, designateCheckInstructor } from "@/db/access/stage-checks";
import { LEVELS, QUESTION_OUTCOMES } from "@/lib/records/outcome";
import { QUESTION_KINDS, AIRCRAFT_SOURCE_KINDS } from "@/lib/records/questions";

const uuid = z.string().uuid("must be an id");
const reason = z.string().trim().min(3, "give a reason of at least 3 characters").max(2000);
const date = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, "must be a date (yyyy-mm-dd)");
const num = (max: number) => z.number().finite().min(0).max(max);

const questionSchema = z.object({
  syllabusItemId: uuid,
  questionText: z.string().trim().max(2000).optional(),
  answerSummary: z.string().trim().max(2000).default(""),
  outcome: z.enum(QUESTION_OUTCOMES, "choose Solid, Shaky or Not yet"),
  required: z.boolean().default(true),
  prompted: z.boolean().default(false),
  correctiveGiven: z.boolean().default(false),
  generated: z
    .object({
      kind: z.enum(QUESTION_KINDS),
      aircraft: z.object({ kind: z.enum(AIRCRAFT_SOURCE_KINDS), id: z.string().min(1).max(100) }),
      inputs: z.object({
        massKg: num(100_000).optional(),
        altitudeFt: z.number().finite().min(-2000).max(60_000).optional(),
        speedKt: num(1000).optional(),
        heightFt: num(60_000).optional(),
      }),
    })
    .optional(),
  studentFigure: z.number().finite().nullable().optional(),
});

const recordCheckSchema = z.object({
  studentId: uuid,
  itemIds: z.array(uuid).min(1, "choose at least one syllabus item").max(20),
  sessionId: uuid.nullable().optional(),
  levelShown: z.enum(LEVELS, "choose the level of learning shown"),
  remarks: z.string().trim().max(4000).default(""),
  durationMinutes: z.number().int("whole minutes").min(1, "at least 1 minute").max(600),
  occurredAt: z.coerce.date("must be a date and time"),
  questions: z.array(questionSchema).min(1, "record at least one question").max(40),
  amends: z.object({ checkId: uuid, reason }).optional(),
});

export async function recordCheckAction(input: unknown) {
  return runAction(
    "checks.record",
    recordCheckSchema,
    input,
    async (data, { user, t }) => {
      const r = await recordOralCheck(t, user, data);
      revalidatePath(`/records/${data.studentId}`);
      return r;
    },
    { idempotent: "check.record" },
  );
}

export async function withdrawCheckAction(input: unknown) {
  return runAction("records.amend", z.object({ checkId: uuid, reason }), input, async (data, { user, t }) =>
    withdrawOralCheck(t, user, data),
  );
}

const signSchema = z.object({
  studentId: uuid,
  itemId: uuid,
  basisCheckId: uuid.optional(),
  signedOn: date.optional(),
  password: z.string().min(1, "re-enter your password").max(200),
});

export async function signOffAction(input: unknown) {
  return runAction("records.sign", signSchema, input, async (data, { user, t }) => {
    const r = await signOff(t, user, data);
    revalidatePath(`/records/${data.studentId}`);
    return { id: r.id, itemCode: r.itemCode, signatureHash: r.signatureHash, generation: r.generation };
  });
}

export async function withdrawSignOffAction(input: unknown) {
  return runAction("records.amend", z.object({ signOffId: uuid, reason }), input, async (data, { user, t }) =>
    withdrawSignOff(t, user, data),
  );
}

export async function amendSignOffAction(input: unknown) {
  return runAction(
    "records.amend",
    z.object({
      signOffId: uuid,
      reason,
      basisCheckId: uuid.optional(),
      signedOn: date.optional(),
      password: z.string().min(1, "re-enter your password").max(200),
    }),
    input,
    async (data, { user, t }) => {
      const r = await amendSignOff(t, user, data);
      return { id: r.id, signatureHash: r.signatureHash, generation: r.generation };
    },
  );
}

const stageCheckSchema = z.object({
  studentId: uuid,
  stageId: uuid,
  result: z.enum(["pass", "fail"], "choose pass or fail"),
  oralOutcomes: z.array(z.object({ itemId: uuid, outcome: z.enum(QUESTION_OUTCOMES), note: z.string().max(500).optional() })).max(40),
  writtenScorePercent: z.number().finite().min(0, "0 to 100").max(100, "0 to 100").nullable().optional(),
  remarks: z.string().trim().max(4000).default(""),
  occurredAt: z.coerce.date("must be a date and time"),
  overrideReason: z.string().trim().max(2000).optional(),
});

export async function conductStageCheckAction(input: unknown) {
  return runAction("stagechecks.conduct", stageCheckSchema, input, async (data, { user, t }) => {
    const r = await conductStageCheck(t, user, data);
    revalidatePath(`/records/${data.studentId}`);
    return r;
  });
}

export async function designateCheckInstructorAction(input: unknown) {
  return runAction("stagechecks.designate", z.object({ personId: uuid, checkInstructor: z.boolean() }), input, async (data, { user, t }) =>
    designateCheckInstructor(t, user, data),
  );
}
