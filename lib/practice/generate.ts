import {
  QUESTION_INPUTS_NEEDED,
  QUESTION_KINDS,
  QuestionInputError,
  HEAVIER_FACTOR,
  STALL_BASED_KINDS,
  altitudeCeilingFt,
  figureWithinTolerance,
  generateQuestion,
  type AircraftSnapshot,
  type GeneratedQuestion,
  type QuestionInputs,
  type QuestionKind,
} from "@/lib/records/questions";

// Practice questions (pure): inputs picked at random inside the aircraft, the question and its
// answer computed by lib/records/questions.ts (lib/aero), and the student's answer scored at once.
// Practice is never an oral check: nothing here writes or reads Records.

export type PracticeGiven = { figure: number } | { choice: "stable" | "unstable" };

const round = (v: number, step: number) => Math.round(v / step) * step;

/** Candidate inputs for a kind, inside the aircraft's mass and altitude limits; `rand` returns 0 … 1. */
export function practiceInputs(kind: QuestionKind, snap: AircraftSnapshot, rand: () => number): QuestionInputs {
  const { emptyMassKg, maxMassKg } = snap.limits;
  const heavier = kind === "vmd_heavier";
  // "15 % more" must stay within the maximum mass too
  const top = heavier ? maxMassKg / HEAVIER_FACTOR : maxMassKg;
  const low = Math.min(top, Math.max(emptyMassKg, emptyMassKg + (top - emptyMassKg) * 0.3));
  const massKg = Math.max(Math.ceil(low / 10) * 10, Math.min(Math.floor(top / 10) * 10, round(low + (top - low) * rand(), 10)));
  const altitudeFt = Math.min(altitudeCeilingFt(snap.limits), round(8_000 * rand(), 500));
  const inputs: QuestionInputs = {};
  for (const field of QUESTION_INPUTS_NEEDED[kind]) {
    if (field === "massKg") inputs.massKg = massKg;
    if (field === "altitudeFt") inputs.altitudeFt = altitudeFt;
    if (field === "heightFt") inputs.heightFt = round(1_000 + 5_000 * rand(), 500);
    if (field === "speedKt") inputs.speedKt = round(50 + 90 * rand(), 5);
  }
  return inputs;
}

/** The kinds this aircraft can be asked (no stall-based kind without a CLmax). */
export function practiceKinds(snap: AircraftSnapshot): QuestionKind[] {
  return QUESTION_KINDS.filter((k) => !STALL_BASED_KINDS.includes(k) || snap.aircraft.maxLiftCoefficient !== undefined);
}

/** A practice question of this kind on this aircraft, or null when no inputs within the aircraft were found. */
export function makePracticeQuestion(kind: QuestionKind, snap: AircraftSnapshot, rand: () => number): GeneratedQuestion | null {
  for (let i = 0; i < 40; i++) {
    try {
      return generateQuestion(kind, snap, practiceInputs(kind, snap, rand), { answerMode: "exact" });
    } catch (e) {
      if (!(e instanceof QuestionInputError)) throw e;
    }
  }
  return null;
}

/** Whether the answer given is right: a figure within the question's accepted range, or the right side of Vmd. */
export function scorePractice(q: GeneratedQuestion, given: PracticeGiven): boolean {
  if (q.answer.type === "choice") return "choice" in given && given.choice === q.answer.value;
  return "figure" in given && figureWithinTolerance(q, given.figure) === true;
}

/** A practice test's result against the school's pass mark (percent, rounded down never up). */
export function practiceTestResult(correct: number, total: number, passMarkPercent: number) {
  const percent = total === 0 ? 0 : Math.floor((correct * 100) / total);
  return { correct, total, percent, passMarkPercent, passed: total > 0 && percent >= passMarkPercent };
}
