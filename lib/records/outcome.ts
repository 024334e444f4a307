/**
 * The written rule that decides an oral check's overall outcome. The rule's id and text are
 * stored with every check, so a later change of the rule never rewrites an old record.
 * Pure: used by the form (preview) and by the server (the value that is stored).
 */
import { CHECK_OUTCOME_WORDS, QUESTION_OUTCOME_WORDS } from "@/lib/labels";

export const LEVELS = ["rote", "understanding", "application", "correlation"] as const;
export type LevelOfLearning = (typeof LEVELS)[number];
export const LEVEL_LABEL: Record<LevelOfLearning, string> = {
  rote: "Rote",
  understanding: "Understanding",
  application: "Application",
  correlation: "Correlation",
};

export const QUESTION_OUTCOMES = ["solid", "shaky", "not_yet"] as const;
export type QuestionOutcome = (typeof QUESTION_OUTCOMES)[number];
export const OUTCOME_LABEL: Record<QuestionOutcome, string> = QUESTION_OUTCOME_WORDS;

export type CheckOutcome = "meets" | "not_yet";
export const CHECK_OUTCOME_LABEL: Record<CheckOutcome, string> = CHECK_OUTCOME_WORDS;

export interface OutcomeRule {
  id: string;
  text: string;
}

export const DEFAULT_OUTCOME_RULE: OutcomeRule = {
  id: "required-solid-and-level/1",
  text:
    "For each syllabus item the check covers, the check meets the standard only if at least one question on a required element of the item was asked, " +
    "every question on a required element of the item is Solid, and the level of learning shown reaches the level the item requires. " +
    "The check as a whole meets the standard only if it does so for every item it covers.",
};

export function levelReaches(shown: LevelOfLearning, required: LevelOfLearning): boolean {
  return LEVELS.indexOf(shown) >= LEVELS.indexOf(required);
}

export interface RuleItem {
  id: string;
  code: string;
  requiredLevel: LevelOfLearning;
}
export interface RuleQuestion {
  syllabusItemId: string;
  outcome: QuestionOutcome;
  required: boolean;
}
export interface ItemOutcome {
  itemId: string;
  code: string;
  meets: boolean;
  /** why the item does not meet the standard; empty when it does */
  reasons: string[];
}

/** Applies the default rule. */
export function evaluateCheck(input: { levelShown: LevelOfLearning; items: RuleItem[]; questions: RuleQuestion[] }): {
  outcome: CheckOutcome;
  items: ItemOutcome[];
} {
  const items = input.items.map((item): ItemOutcome => {
    const reasons: string[] = [];
    const required = input.questions.filter((q) => q.syllabusItemId === item.id && q.required);
    if (required.length === 0) reasons.push(`no question on a required element of ${item.code} was asked`);
    const notSolid = required.filter((q) => q.outcome !== "solid");
    if (notSolid.length > 0) reasons.push(`${notSolid.length} required question${notSolid.length === 1 ? " is" : "s are"} not Solid`);
    if (!levelReaches(input.levelShown, item.requiredLevel)) {
      reasons.push(
        `the level of learning shown (${LEVEL_LABEL[input.levelShown]}) is below what ${item.code} requires (${LEVEL_LABEL[item.requiredLevel]})`,
      );
    }
    return { itemId: item.id, code: item.code, meets: reasons.length === 0, reasons };
  });
  return { outcome: items.length > 0 && items.every((i) => i.meets) ? "meets" : "not_yet", items };
}

const SEVERITY: Record<QuestionOutcome, number> = { solid: 0, shaky: 1, not_yet: 2 };

/**
 * One item's own result in one check, over all of its questions in that check (not its last
 * question): the weakest outcome among its questions on required elements, or among all of its
 * questions when none was on a required element; null when the check asked nothing on it.
 */
export function itemOwnOutcome(itemId: string, questions: RuleQuestion[]): QuestionOutcome | null {
  const mine = questions.filter((q) => q.syllabusItemId === itemId);
  const counted = mine.some((q) => q.required) ? mine.filter((q) => q.required) : mine;
  let worst: QuestionOutcome | null = null;
  for (const q of counted) if (worst === null || SEVERITY[q.outcome] > SEVERITY[worst]) worst = q.outcome;
  return worst;
}
