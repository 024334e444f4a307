import {
  AERO_LIBRARY_VERSION,
  INCOMPRESSIBLE_MACH_LIMIT,
  equivalentToTrue,
  ftToM,
  glideDistance,
  ktToMs,
  minimumDragSpeed,
  msToKt,
  speedStability,
  stallSpeed,
  validateAircraft,
  validity,
  validityText,
  type Aircraft,
} from "@/lib/aero";

/**
 * Generated numeric questions for oral checks, computed by lib/aero. Pure: the form shows a
 * preview with the same function the server uses to compute the stored answer. Each question
 * keeps its inputs, a snapshot of the aircraft, the library's version, the answer, the answer
 * mode (rule of thumb accepted or exact answer asked) and the accepted range, so a later edit of
 * the aircraft profile never changes a recorded check.
 *
 * Questions stay inside the aircraft (each refusal is a QuestionInputError naming the form's
 * box, in the box's units):
 * - mass between the profile's empty and maximum mass (for "15 % more mass", the heavier mass too);
 * - every speed the question states or answers at or above 1.1 × the stall speed at that mass
 *   (when the profile has a CLmax) and at or below Mach 0.3 (lib/aero's `validity`);
 * - altitude from −1,000 ft up to the profile's ceiling; a profile without a ceiling gets the
 *   ISA troposphere, up to 36,000 ft (the tropopause is at 11,000 m = 36,089 ft, where the
 *   lapse-rate law of the atmosphere model ends); a glide's height from 1 ft up to the same limit;
 * - "stable or unstable?" never inside the neutral band: a speed within 5 % of Vmd is refused
 *   (`STABILITY_BAND_FRACTION`), so every answer is clear-cut (the curve is nearly flat there,
 *   REFERENCES.md §8.2);
 * - a profile without CLmax keeps none in the snapshot and is asked no stall-based question
 *   (a question whose input is a speed needs the stall speed to be checked).
 */
export const QUESTION_KINDS = ["vmd", "vmd_heavier", "stability_side", "glide_distance"] as const;
export type QuestionKind = (typeof QUESTION_KINDS)[number];

export const QUESTION_KIND_LABEL: Record<QuestionKind, string> = {
  vmd: "Vmd at a mass and altitude",
  vmd_heavier: "Vmd with 15 % more mass",
  stability_side: "Speed-stable or speed-unstable side",
  glide_distance: "Still-air glide distance from a height",
};

/** The inputs each kind asks for, in the order the form shows them. */
export const QUESTION_INPUTS_NEEDED: Record<QuestionKind, readonly (keyof QuestionInputs)[]> = {
  vmd: ["massKg", "altitudeFt"],
  vmd_heavier: ["massKg"],
  stability_side: ["massKg", "altitudeFt", "speedKt"],
  glide_distance: ["heightFt"],
};

/** The form's boxes, with the units typed in them; every refusal starts with the box's label. */
export const QUESTION_INPUT_LABEL = {
  massKg: "Mass (kg)",
  altitudeFt: "Altitude (ft)",
  speedKt: "Speed (kt EAS)",
  heightFt: "Height (ft)",
} as const;

/** Kinds that need the stall speed (their input is a speed): refused for a profile without CLmax. */
export const STALL_BASED_KINDS: readonly QuestionKind[] = ["stability_side"];

/** Mass factor of the "15 % more mass" question. */
export const HEAVIER_FACTOR = 1.15;
/** Lowest speed a question may state or answer, as a multiple of the stall speed at that mass. */
export const STALL_MARGIN = 1.1;
/** Half-width of the neutral band around Vmd, as a fraction of Vmd, inside which "stable or unstable?" is not asked. */
export const STABILITY_BAND_FRACTION = 0.05;
/** Altitude range when the profile gives no ceiling: −1,000 ft to the ISA tropopause (36,089 ft), rounded down. */
export const DEFAULT_ALTITUDE_RANGE_FT = { min: -1000, max: 36_000 } as const;

export const AIRCRAFT_SOURCE_KINDS = ["demo", "airframe", "reference"] as const;
export type AircraftSourceKind = (typeof AIRCRAFT_SOURCE_KINDS)[number];

/** An aircraft as a question stores it: the polar, and CLmax only when the profile gives one. */
export type QuestionAircraft = Omit<Aircraft, "maxLiftCoefficient"> & { maxLiftCoefficient?: number };

/** The profile's limits a question must stay inside. */
export interface ProfileLimits {
  emptyMassKg: number;
  maxMassKg: number;
  /** the profile's ceiling; absent when the profile gives none (then DEFAULT_ALTITUDE_RANGE_FT) */
  ceilingFt?: number | undefined;
}

export interface AircraftSnapshot {
  name: string;
  /** where the numbers came from: a demo revision (its frozen airframe), an airframe of Curve Lab, or a reference aircraft of this module */
  source: { kind: AircraftSourceKind; id: string };
  aircraft: QuestionAircraft;
  limits: ProfileLimits;
}

export interface QuestionInputs {
  massKg?: number | undefined;
  altitudeFt?: number | undefined;
  speedKt?: number | undefined;
  heightFt?: number | undefined;
}

/**
 * Whether the trade's rule of thumb is accepted or the exact answer is asked. "exact": within
 * NUMERIC_TOLERANCE of the library's answer. "rule_of_thumb": anything from the rule's answer to
 * the exact one, with NUMERIC_TOLERANCE either side (only for kinds with a rule, RULE_OF_THUMB).
 */
export const ANSWER_MODES = ["exact", "rule_of_thumb"] as const;
export type AnswerMode = (typeof ANSWER_MODES)[number];
export const ANSWER_MODE_LABEL: Record<AnswerMode, string> = {
  exact: "Exact answer asked",
  rule_of_thumb: "Rule of thumb accepted",
};

/** The rule of thumb of each kind that has one (common practice, REFERENCES.md §4.3 and §5.6). */
export const RULE_OF_THUMB: Partial<Record<QuestionKind, string>> = {
  vmd: "TAS = IAS + 2 % per 1,000 ft",
  vmd_heavier: "speeds grow by half the percentage of the mass increase",
};

export type GeneratedAnswer =
  | { type: "number"; value: number; unit: string; display: string }
  | { type: "choice"; value: "stable" | "unstable" | "neutral"; display: string };

export interface GeneratedQuestion {
  kind: QuestionKind;
  text: string;
  inputs: QuestionInputs;
  aircraft: AircraftSnapshot;
  libraryVersion: string;
  answer: GeneratedAnswer;
  /** relative tolerance on a numeric answer (0.03 = 3 %); null for a choice */
  tolerance: { relative: number } | null;
  /** the instructor's choice for a numeric question (absent on questions stored before the choice existed: exact) */
  answerMode?: AnswerMode;
  /** the rule of thumb's answer, when the rule is accepted */
  ruleOfThumb?: { rule: string; value: number };
  /** the range of figures accepted, in the answer's unit (absent on a choice) */
  accepted?: { low: number; high: number };
}

/**
 * A refused input. `message` starts with the input's key ("massKg: 1,100 kg is above …"), as every
 * server message does (the action turns the key into the box's words); `boxMessage` starts with the
 * form's box label and unit ("Mass (kg): 1,100 kg is above …") for the form's preview.
 */
export class QuestionInputError extends Error {
  constructor(
    public readonly field: string,
    public readonly detail: string,
    public readonly boxMessage: string,
  ) {
    super(`${field}: ${detail}`);
    this.name = "QuestionInputError";
  }
}

type InputField = keyof QuestionInputs;

const fmt = (v: number, digits = 0) => v.toLocaleString("en-GB", { minimumFractionDigits: digits, maximumFractionDigits: digits });

function refuse(field: InputField | "aircraft" | "kind" | "answerMode", text: string): never {
  const label =
    field in QUESTION_INPUT_LABEL
      ? QUESTION_INPUT_LABEL[field as InputField]
      : field === "aircraft"
        ? "Aircraft"
        : field === "kind"
          ? "Kind"
          : "Answer";
  throw new QuestionInputError(field, text, `${label}: ${text}`);
}

function need(inputs: QuestionInputs, field: InputField): number {
  const v = inputs[field];
  if (typeof v !== "number" || !Number.isFinite(v)) refuse(field, "enter a number");
  return v;
}

/** Numeric answers are accepted within 3 % (a mental or whiteboard estimate). */
export const NUMERIC_TOLERANCE = 0.03;

/** The highest altitude (ft) a question may use for this profile. */
export function altitudeCeilingFt(limits: ProfileLimits): number {
  return limits.ceilingFt ?? DEFAULT_ALTITUDE_RANGE_FT.max;
}

function checkMass(snap: AircraftSnapshot, massKg: number, factor = 1): void {
  const { emptyMassKg, maxMassKg } = snap.limits;
  if (massKg < emptyMassKg)
    refuse(
      "massKg",
      `${fmt(massKg)} kg is below the empty mass of the ${snap.name} (${fmt(emptyMassKg)} kg); enter ${fmt(emptyMassKg)} to ${fmt(maxMassKg / factor)} kg`,
    );
  if (massKg * factor > maxMassKg) {
    const more = factor === 1 ? `${fmt(massKg)} kg is` : `with 15 % more, ${fmt(massKg)} kg becomes ${fmt(massKg * factor)} kg, which is`;
    refuse(
      "massKg",
      `${more} above the maximum mass of the ${snap.name} (${fmt(maxMassKg)} kg); enter ${fmt(emptyMassKg)} to ${fmt(Math.floor(maxMassKg / factor))} kg`,
    );
  }
}

function checkAltitude(snap: AircraftSnapshot, field: "altitudeFt" | "heightFt", ft: number, min: number): void {
  const top = altitudeCeilingFt(snap.limits);
  const whose =
    snap.limits.ceilingFt !== undefined ? `the ceiling of the ${snap.name}` : "the top of the standard atmosphere's troposphere used here";
  if (ft < min) refuse(field, `${fmt(ft)} ft is below ${fmt(min)} ft; enter ${fmt(min)} to ${fmt(top)} ft`);
  if (ft > top) refuse(field, `${fmt(ft)} ft is above ${whose} (${fmt(top)} ft); enter ${fmt(min)} to ${fmt(top)} ft`);
}

/** The aircraft lib/aero computes with. A profile without CLmax gets a stand-in that enters no answer asked of it. */
function aeroAircraft(a: QuestionAircraft, massKg?: number): Aircraft {
  return validateAircraft({
    ...a,
    maxLiftCoefficient: a.maxLiftCoefficient ?? NO_CLMAX_STAND_IN,
    ...(massKg !== undefined ? { massKg } : {}),
  });
}
/** Used only for Vmd and glide answers, which do not depend on CLmax; never stored. */
const NO_CLMAX_STAND_IN = 1;

/** Refuses a speed (EAS, m/s) below 1.1 Vs at the mass, or above Mach 0.3 at the altitude. `what` says which speed. */
function checkSpeed(
  snap: AircraftSnapshot,
  field: InputField | "aircraft",
  easMs: number,
  massKg: number,
  altitudeM: number,
  what: string,
): void {
  const a = snap.aircraft;
  if (a.maxLiftCoefficient !== undefined) {
    const vs = stallSpeed(aeroAircraft(a, massKg), { altitudeM }).equivalentAirspeedMs;
    if (easMs < STALL_MARGIN * vs * (1 - 1e-12)) {
      const floorKt = msToKt(STALL_MARGIN * vs);
      refuse(
        field,
        field === "speedKt"
          ? `${fmt(msToKt(easMs), 1)} kt is below 1.1 × the stall speed (1.1 × ${fmt(msToKt(vs), 1)} = ${fmt(floorKt, 1)} kt EAS at ${fmt(massKg)} kg); enter at least ${fmt(Math.ceil(floorKt))} kt`
          : `${what} of the ${snap.name} (${fmt(msToKt(easMs), 1)} kt EAS) is below 1.1 × its stall speed (${fmt(floorKt, 1)} kt EAS); choose another aircraft or question`,
      );
    }
  }
  const tas = equivalentToTrue(easMs, altitudeM);
  const v = validity(aeroAircraft(a, massKg), { altitudeM, trueAirspeedMs: tas });
  if (v.flags.includes("compressible")) {
    const maxKt = Math.floor(msToKt((easMs * INCOMPRESSIBLE_MACH_LIMIT) / v.machNumber));
    refuse(
      field,
      field === "speedKt"
        ? `${fmt(msToKt(easMs), 1)} kt is Mach ${fmt(v.machNumber, 3)} at this altitude (${validityText(["compressible"])}); enter at most ${fmt(maxKt)} kt`
        : `${what} of the ${snap.name} (${fmt(msToKt(easMs), 1)} kt EAS) is Mach ${fmt(v.machNumber, 3)} at this altitude (${validityText(["compressible"])}); choose a lower altitude or another aircraft`,
    );
  }
}

function numericAnswer(
  kind: QuestionKind,
  mode: AnswerMode,
  value: number,
  ruleValue: number | null,
): Pick<GeneratedQuestion, "tolerance" | "answerMode" | "ruleOfThumb" | "accepted"> {
  const rel = NUMERIC_TOLERANCE;
  if (mode === "rule_of_thumb") {
    const rule = RULE_OF_THUMB[kind];
    if (!rule || ruleValue === null) refuse("answerMode", "this question has no rule of thumb; ask for the exact answer");
    return {
      tolerance: { relative: rel },
      answerMode: mode,
      ruleOfThumb: { rule, value: ruleValue },
      accepted: { low: Math.min(value, ruleValue) * (1 - rel), high: Math.max(value, ruleValue) * (1 + rel) },
    };
  }
  return { tolerance: { relative: rel }, answerMode: "exact", accepted: { low: value * (1 - rel), high: value * (1 + rel) } };
}

/** A copy of the aircraft as stored: CLmax only when the profile has one. */
function storedSnapshot(snap: AircraftSnapshot): AircraftSnapshot {
  const a = aeroAircraft(snap.aircraft);
  const polar: QuestionAircraft = { ...a };
  delete polar.maxLiftCoefficient;
  const aircraft: QuestionAircraft =
    snap.aircraft.maxLiftCoefficient === undefined ? polar : { ...polar, maxLiftCoefficient: snap.aircraft.maxLiftCoefficient };
  const limits: ProfileLimits = { emptyMassKg: snap.limits.emptyMassKg, maxMassKg: snap.limits.maxMassKg };
  if (snap.limits.ceilingFt !== undefined) limits.ceilingFt = snap.limits.ceilingFt;
  return { name: snap.name, source: { ...snap.source }, aircraft, limits };
}

export function generateQuestion(
  kind: QuestionKind,
  snapshot: AircraftSnapshot,
  inputs: QuestionInputs,
  options: { answerMode?: AnswerMode | undefined } = {},
): GeneratedQuestion {
  if (!QUESTION_KINDS.includes(kind)) refuse("kind", "choose a kind of question");
  const stored = storedSnapshot(snapshot);
  const mode = options.answerMode ?? "exact";
  if (STALL_BASED_KINDS.includes(kind) && stored.aircraft.maxLiftCoefficient === undefined)
    refuse(
      "aircraft",
      `the ${stored.name} has no CLmax on its profile, so a speed cannot be checked against its stall; choose another aircraft or question`,
    );
  const name = stored.name;
  const common = { kind, aircraft: stored, libraryVersion: AERO_LIBRARY_VERSION };
  const minAltitude = DEFAULT_ALTITUDE_RANGE_FT.min;
  switch (kind) {
    case "vmd": {
      const massKg = need(inputs, "massKg");
      const altitudeFt = need(inputs, "altitudeFt");
      checkMass(stored, massKg);
      checkAltitude(stored, "altitudeFt", altitudeFt, minAltitude);
      const altitudeM = ftToM(altitudeFt);
      const r = minimumDragSpeed(aeroAircraft(stored.aircraft, massKg), { altitudeM });
      checkSpeed(stored, "aircraft", r.equivalentAirspeedMs, massKg, altitudeM, "Vmd");
      const tasKt = msToKt(r.trueAirspeedMs);
      const easKt = msToKt(r.equivalentAirspeedMs);
      // rule of thumb: TAS = IAS (= EAS here) + 2 % per 1,000 ft (REFERENCES.md §4.3)
      const ruleKt = easKt * (1 + (0.02 * altitudeFt) / 1000);
      return {
        ...common,
        text: `${name} at ${fmt(massKg)} kg, ${fmt(altitudeFt)} ft in ISA: what is Vmd as a true airspeed?`,
        inputs: { massKg, altitudeFt },
        answer: {
          type: "number",
          value: tasKt,
          unit: "kt",
          display: `${fmt(tasKt, 1)} kt TAS (${fmt(easKt, 1)} kt EAS)`,
        },
        ...numericAnswer(kind, mode, tasKt, ruleKt),
      };
    }
    case "vmd_heavier": {
      const massKg = need(inputs, "massKg");
      checkMass(stored, massKg, HEAVIER_FACTOR);
      const before = minimumDragSpeed(aeroAircraft(stored.aircraft, massKg), { altitudeM: 0 });
      const after = minimumDragSpeed(aeroAircraft(stored.aircraft, massKg * HEAVIER_FACTOR), { altitudeM: 0 });
      checkSpeed(stored, "aircraft", before.equivalentAirspeedMs, massKg, 0, "Vmd");
      const beforeKt = msToKt(before.equivalentAirspeedMs);
      const afterKt = msToKt(after.equivalentAirspeedMs);
      // rule of thumb: half the percentage, 15 % more mass → 7.5 % more speed (REFERENCES.md §5.6)
      const ruleKt = beforeKt * (1 + (HEAVIER_FACTOR - 1) / 2);
      return {
        ...common,
        text: `${name}: Vmd is ${fmt(beforeKt, 1)} kt EAS at ${fmt(massKg)} kg. What does it become with 15 % more mass?`,
        inputs: { massKg },
        answer: {
          type: "number",
          value: afterKt,
          unit: "kt",
          display: `${fmt(afterKt, 1)} kt EAS (up ${fmt(afterKt - beforeKt, 1)} kt, about 7 %: Vmd grows with the square root of weight)`,
        },
        ...numericAnswer(kind, mode, afterKt, ruleKt),
      };
    }
    case "stability_side": {
      if (mode !== "exact") refuse("answerMode", "a stable-or-unstable question has no rule of thumb; ask for the exact answer");
      const massKg = need(inputs, "massKg");
      const altitudeFt = need(inputs, "altitudeFt");
      const speedKt = need(inputs, "speedKt");
      checkMass(stored, massKg);
      checkAltitude(stored, "altitudeFt", altitudeFt, minAltitude);
      if (!(speedKt > 0)) refuse("speedKt", "enter a speed above 0 kt");
      const altitudeM = ftToM(altitudeFt);
      const plane = aeroAircraft(stored.aircraft, massKg);
      checkSpeed(stored, "speedKt", ktToMs(speedKt), massKg, altitudeM, "The speed");
      const vmdEasKt = msToKt(minimumDragSpeed(plane, { altitudeM }).equivalentAirspeedMs);
      if (Math.abs(speedKt / vmdEasKt - 1) < STABILITY_BAND_FRACTION)
        refuse(
          "speedKt",
          `${fmt(speedKt, 1)} kt is within 5 % of Vmd (${fmt(vmdEasKt, 1)} kt EAS), where the curve is nearly flat and the answer is not clear-cut; enter at most ${fmt(Math.floor(vmdEasKt * (1 - STABILITY_BAND_FRACTION)))} kt or at least ${fmt(Math.ceil(vmdEasKt * (1 + STABILITY_BAND_FRACTION)))} kt`,
        );
      const tas = equivalentToTrue(ktToMs(speedKt), altitudeM);
      const r = speedStability(plane, { altitudeM, trueAirspeedMs: tas });
      const label =
        r.regime === "stable" ? "Speed-stable (above Vmd)" : r.regime === "unstable" ? "Speed-unstable (below Vmd)" : "Neutral (at Vmd)";
      return {
        ...common,
        text: `${name} at ${fmt(massKg)} kg, flying at ${fmt(speedKt)} kt EAS at ${fmt(altitudeFt)} ft with thrust held: is it on the speed-stable or the speed-unstable side?`,
        inputs: { massKg, altitudeFt, speedKt },
        answer: { type: "choice", value: r.regime, display: `${label}; Vmd is ${fmt(vmdEasKt, 1)} kt EAS` },
        tolerance: null,
        answerMode: "exact",
      };
    }
    case "glide_distance": {
      const heightFt = need(inputs, "heightFt");
      checkAltitude(stored, "heightFt", heightFt, 1);
      const r = glideDistance(aeroAircraft(stored.aircraft), { heightM: ftToM(heightFt) });
      const nm = r.distanceM / 1852;
      return {
        ...common,
        text: `${name}, engine off at ${fmt(heightFt)} ft above the ground in still air at best glide: how far can it glide?`,
        inputs: { heightFt },
        answer: {
          type: "number",
          value: nm,
          unit: "NM",
          display: `${fmt(nm, 1)} NM (${fmt(r.distanceM / 1000, 1)} km; glide ratio ${fmt(r.glideRatio, 1)} : 1)`,
        },
        ...numericAnswer(kind, mode, nm, null),
      };
    }
  }
}

/** The range of figures accepted for a numeric question (stored questions without one: the relative tolerance). */
export function acceptedRange(q: GeneratedQuestion): { low: number; high: number } | null {
  if (q.answer.type !== "number" || !q.tolerance) return null;
  if (q.accepted) return q.accepted;
  const d = Math.abs(q.answer.value) * q.tolerance.relative;
  return { low: q.answer.value - d, high: q.answer.value + d };
}

/** Whether a student's figure is within the question's accepted range (numeric questions only). */
export function figureWithinTolerance(q: GeneratedQuestion, figure: number): boolean | null {
  const r = acceptedRange(q);
  if (!r) return null;
  return figure >= r.low && figure <= r.high;
}

/** The tolerance as the form and the record show it; it follows the instructor's choice. */
export function toleranceText(q: GeneratedQuestion): string {
  const r = acceptedRange(q);
  if (!r || q.answer.type !== "number" || !q.tolerance) return "";
  const unit = q.answer.unit;
  const pct = `${fmt(q.tolerance.relative * 100)} %`;
  if (q.answerMode === "rule_of_thumb" && q.ruleOfThumb)
    return `rule of thumb accepted (${q.ruleOfThumb.rule}: ${fmt(q.ruleOfThumb.value, 1)} ${unit}): accepted ${fmt(r.low, 1)} to ${fmt(r.high, 1)} ${unit}, the rule's answer to the exact one with ${pct} either side`;
  return `exact answer asked: accepted within ${pct}, ${fmt(r.low, 1)} to ${fmt(r.high, 1)} ${unit}`;
}

/**
 * The instructor's answer mode of a stored question with its tolerance, as the record, the student's
 * pages and the printed record show it: "Rule of thumb accepted (…): accepted … kt" or "Exact answer
 * asked: accepted within 3 %, …". A question stored before the choice existed was asked exactly.
 */
export function answerModeText(q: GeneratedQuestion): string {
  const text = toleranceText(q);
  if (!text) return `${ANSWER_MODE_LABEL.exact} (a choice, no tolerance)`;
  return text.charAt(0).toUpperCase() + text.slice(1);
}

/**
 * Reference aircraft of our own for questions when no airframe is chosen. Numbers invented
 * for teaching, of the size of a two- to four-seat trainer.
 */
export const REFERENCE_AIRCRAFT: AircraftSnapshot[] = [
  {
    name: "Larkhollow LT-2 trainer",
    source: { kind: "reference", id: "lt-2" },
    aircraft: {
      massKg: 1050,
      wingAreaM2: 15.2,
      wingSpanM: 10.4,
      zeroLiftDragCoefficient: 0.029,
      oswaldEfficiency: 0.78,
      maxLiftCoefficient: 1.45,
    },
    limits: { emptyMassKg: 720, maxMassKg: 1050, ceilingFt: 13_000 },
  },
  {
    name: "Larkhollow LT-4 tourer",
    source: { kind: "reference", id: "lt-4" },
    aircraft: {
      massKg: 1320,
      wingAreaM2: 16.4,
      wingSpanM: 11.0,
      zeroLiftDragCoefficient: 0.026,
      oswaldEfficiency: 0.8,
      maxLiftCoefficient: 1.5,
    },
    limits: { emptyMassKg: 850, maxMassKg: 1320, ceilingFt: 15_500 },
  },
];
