import {
  AERO_LIBRARY_VERSION,
  equivalentToTrue,
  ftToM,
  glideDistance,
  ktToMs,
  minimumDragSpeed,
  msToKt,
  speedStability,
  validateAircraft,
  type Aircraft,
} from "@/lib/aero";

/**
 * Generated numeric questions for oral checks, computed by lib/aero. Pure: the form shows a
 * preview with the same function the server uses to compute the stored answer. Each question
 * keeps its inputs, a snapshot of the aircraft, the library's version, the answer and the
 * tolerance, so a later edit of the aircraft profile never changes a recorded check.
 */
export const QUESTION_KINDS = ["vmd", "vmd_heavier", "stability_side", "glide_distance"] as const;
export type QuestionKind = (typeof QUESTION_KINDS)[number];

export const QUESTION_KIND_LABEL: Record<QuestionKind, string> = {
  vmd: "Vmd at a mass and altitude",
  vmd_heavier: "Vmd with 15 % more mass",
  stability_side: "Speed-stable or speed-unstable side",
  glide_distance: "Still-air glide distance from a height",
};

export const AIRCRAFT_SOURCE_KINDS = ["demo", "airframe", "reference"] as const;
export type AircraftSourceKind = (typeof AIRCRAFT_SOURCE_KINDS)[number];

export interface AircraftSnapshot {
  name: string;
  /** where the numbers came from: a demo revision (its frozen airframe), an airframe of Curve Lab, or a reference aircraft of this module */
  source: { kind: AircraftSourceKind; id: string };
  aircraft: Aircraft;
}

export interface QuestionInputs {
  massKg?: number;
  altitudeFt?: number;
  speedKt?: number;
  heightFt?: number;
}

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
}

export class QuestionInputError extends Error {
  constructor(
    message: string,
    public readonly field: string,
  ) {
    super(message);
    this.name = "QuestionInputError";
  }
}

function need(inputs: QuestionInputs, field: keyof QuestionInputs): number {
  const v = inputs[field];
  if (typeof v !== "number" || !Number.isFinite(v)) throw new QuestionInputError(`${field}: a number is required`, field);
  return v;
}

const fmt = (v: number, digits = 0) => v.toLocaleString("en-GB", { minimumFractionDigits: digits, maximumFractionDigits: digits });

/** Numeric answers are accepted within 3 % (a mental or whiteboard estimate). */
export const NUMERIC_TOLERANCE = 0.03;

export function generateQuestion(kind: QuestionKind, snapshot: AircraftSnapshot, inputs: QuestionInputs): GeneratedQuestion {
  const base = validateAircraft(snapshot.aircraft);
  const name = snapshot.name;
  const common = { kind, aircraft: { ...snapshot, aircraft: { ...base } }, libraryVersion: AERO_LIBRARY_VERSION };
  switch (kind) {
    case "vmd": {
      const massKg = need(inputs, "massKg");
      const altitudeFt = need(inputs, "altitudeFt");
      const r = minimumDragSpeed({ ...base, massKg }, { altitudeM: ftToM(altitudeFt) });
      const tasKt = msToKt(r.trueAirspeedMs);
      return {
        ...common,
        text: `${name} at ${fmt(massKg)} kg, ${fmt(altitudeFt)} ft in ISA: what is Vmd as a true airspeed?`,
        inputs: { massKg, altitudeFt },
        answer: {
          type: "number",
          value: tasKt,
          unit: "kt",
          display: `${fmt(tasKt, 1)} kt TAS (${fmt(msToKt(r.equivalentAirspeedMs), 1)} kt EAS)`,
        },
        tolerance: { relative: NUMERIC_TOLERANCE },
      };
    }
    case "vmd_heavier": {
      const massKg = need(inputs, "massKg");
      const before = minimumDragSpeed({ ...base, massKg }, { altitudeM: 0 });
      const after = minimumDragSpeed({ ...base, massKg: massKg * 1.15 }, { altitudeM: 0 });
      const beforeKt = msToKt(before.equivalentAirspeedMs);
      const afterKt = msToKt(after.equivalentAirspeedMs);
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
        tolerance: { relative: NUMERIC_TOLERANCE },
      };
    }
    case "stability_side": {
      const massKg = need(inputs, "massKg");
      const altitudeFt = need(inputs, "altitudeFt");
      const speedKt = need(inputs, "speedKt");
      const altitudeM = ftToM(altitudeFt);
      const tas = equivalentToTrue(ktToMs(speedKt), altitudeM);
      const r = speedStability({ ...base, massKg }, { altitudeM, trueAirspeedMs: tas });
      const vmdEasKt = msToKt(minimumDragSpeed({ ...base, massKg }, { altitudeM }).equivalentAirspeedMs);
      const label =
        r.regime === "stable" ? "Speed-stable (above Vmd)" : r.regime === "unstable" ? "Speed-unstable (below Vmd)" : "Neutral (at Vmd)";
      return {
        ...common,
        text: `${name} at ${fmt(massKg)} kg, flying at ${fmt(speedKt)} kt EAS at ${fmt(altitudeFt)} ft with thrust held: is it on the speed-stable or the speed-unstable side?`,
        inputs: { massKg, altitudeFt, speedKt },
        answer: { type: "choice", value: r.regime, display: `${label}; Vmd is ${fmt(vmdEasKt, 1)} kt EAS` },
        tolerance: null,
      };
    }
    case "glide_distance": {
      const heightFt = need(inputs, "heightFt");
      const r = glideDistance(base, { heightM: ftToM(heightFt) });
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
        tolerance: { relative: NUMERIC_TOLERANCE },
      };
    }
  }
}

/** Whether a student's figure is within the question's tolerance (numeric questions only). */
export function figureWithinTolerance(q: GeneratedQuestion, figure: number): boolean | null {
  if (q.answer.type !== "number" || !q.tolerance) return null;
  return Math.abs(figure - q.answer.value) <= Math.abs(q.answer.value) * q.tolerance.relative;
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
  },
];
