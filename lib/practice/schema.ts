import { z } from "zod";
import { QUESTION_KINDS } from "@/lib/records/questions";

// Practice's zod schemas, used by the practice form and the server actions.

const uuid = z.string().uuid("must be an id");
const finite = (min: number, max: number) => z.number("enter a number").finite("enter a number").min(min).max(max);

export const practiceAnswerSchema = z.object({
  demoRevisionId: uuid,
  itemId: uuid.nullable(),
  kind: z.enum(QUESTION_KINDS, "choose a kind of question"),
  inputs: z
    .object({
      massKg: finite(1, 1_000_000).optional(),
      altitudeFt: finite(-2_000, 60_000).optional(),
      speedKt: finite(1, 1_000).optional(),
      heightFt: finite(1, 60_000).optional(),
    })
    .strict(),
  figure: finite(-1_000_000, 1_000_000).optional(),
  choice: z.enum(["stable", "unstable"], "choose stable or unstable").optional(),
});
export type PracticeAnswer = z.infer<typeof practiceAnswerSchema>;

export const practiceTestSchema = z.object({
  answers: z.array(practiceAnswerSchema).min(1, "answer at least one question").max(20, "at most 20 questions"),
});
