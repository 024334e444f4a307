// Retention of training records (pure): how long a student's record is kept, counted from the
// end of training (the day the enrolment ended: graduation, termination or transfer out).
// Each rule that applies to the school gives a period; the longest wins; a legal hold keeps the
// record however old it is. After the retention date the record is listed for the chief to
// archive; nothing is ever deleted.

export const RETENTION_RULES = {
  /** 14 CFR 141.101(d): a pilot school keeps each student's training record at least 1 year after graduation, termination or transfer */
  school_records: { years: 1, source: "14 CFR 141.101(d)", label: "School training records" },
  /** 14 CFR 61.189(c): an instructor keeps the records of the training given at least 3 years */
  instructor_records: { years: 3, source: "14 CFR 61.189(c)", label: "Instructor records" },
  /** EASA Part-ORA, ORA.ATO.120: an ATO keeps training records at least 3 years after the end of training */
  easa_ato: { years: 3, source: "EASA ORA.ATO.120", label: "EASA training organisation" },
} as const;

export type RetentionRule = keyof typeof RETENTION_RULES;
export const RULE_ORDER: RetentionRule[] = ["school_records", "instructor_records", "easa_ato"];

export type RetentionState = "in_training" | "kept" | "held" | "due" | "archived";

export interface RetentionInput {
  /** the day training ended ("yyyy-MM-dd"), null while the student is in training */
  endedOn: string | null;
  /** the rules that apply to the school */
  rules: RetentionRule[];
  /** a legal hold is in force */
  onHold: boolean;
  /** already marked archived by the chief */
  archived?: boolean;
  /** the school's calendar day today ("yyyy-MM-dd") */
  today: string;
}

export interface RetentionDecision {
  state: RetentionState;
  /** the last day the record must be kept, null in training or when no rule applies */
  keepUntil: string | null;
  /** the rules giving that date (the longest; several when they tie) */
  governing: RetentionRule[];
}

function parts(day: string): [number, number, number] {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(day);
  if (!m) throw new RangeError(`not a calendar date: ${day}`);
  return [Number(m[1]), Number(m[2]), Number(m[3])];
}

/**
 * The same calendar day `years` later; 29 February moves to 1 March in a year without it, so the
 * period is never shorter than the whole years ("at least").
 */
export function addYears(day: string, years: number): string {
  const [y, m, d] = parts(day);
  const target = new Date(Date.UTC(y + years, m - 1, d));
  return target.toISOString().slice(0, 10);
}

/** The retention date and state of one student's record. */
export function retentionFor(input: RetentionInput): RetentionDecision {
  if (input.archived) {
    const d = input.endedOn ? retentionFor({ ...input, archived: false }) : null;
    return { state: "archived", keepUntil: d?.keepUntil ?? null, governing: d?.governing ?? [] };
  }
  if (!input.endedOn) return { state: "in_training", keepUntil: null, governing: [] };
  const rules = RULE_ORDER.filter((r) => input.rules.includes(r));
  if (rules.length === 0) return { state: input.onHold ? "held" : "kept", keepUntil: null, governing: [] };
  const longest = Math.max(...rules.map((r) => RETENTION_RULES[r].years));
  const governing = rules.filter((r) => RETENTION_RULES[r].years === longest);
  const keepUntil = addYears(input.endedOn, longest);
  if (input.onHold) return { state: "held", keepUntil, governing };
  return { state: input.today > keepUntil ? "due" : "kept", keepUntil, governing };
}
