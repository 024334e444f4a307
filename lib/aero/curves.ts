import { SEA_LEVEL_DENSITY_KG_M3 } from "./atmosphere";
import { AeroInputError } from "./errors";
import { LIMITS, checked, requireObject } from "./limits";
import { levelFlightState, type LevelFlightState } from "./polar";
import { FOURTH_ROOT_OF_THREE } from "./speeds";
import type { Aircraft, LevelFlightConditions } from "./types";

/**
 * Sampled drag and power curves for any number of cases over one speed range,
 * for charts that redraw on every slider movement. Each case is validated
 * once; the per-point loop only multiplies, adds and divides into
 * preallocated Float64Arrays (pass `reuse` to write into the previous result
 * and allocate nothing at all).
 */

/** "equivalent": the axis is EAS (= IAS in this model), the same for every altitude; "true": the axis is TAS. */
export type SpeedAxis = "equivalent" | "true";

/** One case of a demo: an aircraft (configuration) at an altitude, ISA deviation and load factor. */
export interface CurveCase extends LevelFlightConditions {
  aircraft: Aircraft;
}

export interface CurveRange {
  /** First speed on the axis, m/s. */
  minSpeedMs: number;
  /** Last speed on the axis, m/s (greater than minSpeedMs). */
  maxSpeedMs: number;
  /** Number of evenly spaced speeds, 2 … 10,000. */
  points: number;
  /** Default "equivalent". */
  speedAxis?: SpeedAxis | undefined;
}

/** Characteristic speeds of a case on the axis's scale (EAS or TAS), for the chart's rules and hatching. */
export interface CaseMarkers {
  minimumDragSpeedMs: number;
  minimumPowerSpeedMs: number;
  stallSpeedMs: number;
  maxLiftToDrag: number;
}

export interface CaseCurves<A> {
  /** TAS at each axis speed, m/s (equal to the axis when speedAxis is "true"). */
  trueAirspeedMs: A;
  zeroLiftDragN: A;
  /** = idealInducedDragN + liftDependentIncrementN. */
  liftDependentDragN: A;
  idealInducedDragN: A;
  liftDependentIncrementN: A;
  totalDragN: A;
  /** D x TAS, W. */
  powerRequiredW: A;
  liftToDrag: A;
  markers: CaseMarkers;
}

export interface CurveSet<A> {
  speedAxis: SpeedAxis;
  points: number;
  /** The shared axis, m/s, from minSpeedMs to maxSpeedMs inclusive. */
  speedsMs: A;
  /** One entry per input case, in the same order. */
  cases: CaseCurves<A>[];
}

export interface SampleCurvesOptions {
  /** "typed" (default): Float64Array; "plain": number[] (copies, for JSON). */
  arrays?: "typed" | "plain";
  /** A previous typed result to overwrite in place when its shape matches (no allocation). */
  reuse?: CurveSet<Float64Array> | undefined;
}

function newCaseCurves(n: number): CaseCurves<Float64Array> {
  return {
    trueAirspeedMs: new Float64Array(n),
    zeroLiftDragN: new Float64Array(n),
    liftDependentDragN: new Float64Array(n),
    idealInducedDragN: new Float64Array(n),
    liftDependentIncrementN: new Float64Array(n),
    totalDragN: new Float64Array(n),
    powerRequiredW: new Float64Array(n),
    liftToDrag: new Float64Array(n),
    markers: { minimumDragSpeedMs: 0, minimumPowerSpeedMs: 0, stallSpeedMs: 0, maxLiftToDrag: 0 },
  };
}

function shapeMatches(set: CurveSet<Float64Array> | undefined, caseCount: number, n: number): set is CurveSet<Float64Array> {
  if (set === undefined || set.points !== n || set.cases.length !== caseCount || set.speedsMs.length !== n) return false;
  for (const c of set.cases) if (c.totalDragN.length !== n) return false;
  return true;
}

function validateRange(range: unknown): { min: number; max: number; n: number; axis: SpeedAxis } {
  const r = requireObject(range, "range");
  const min = checked(LIMITS.minSpeedMs, r.minSpeedMs);
  const max = checked(LIMITS.maxSpeedMs, r.maxSpeedMs);
  if (!(max > min)) {
    throw new AeroInputError("maxSpeedMs", "maxSpeedMs must be greater than minSpeedMs", r.maxSpeedMs);
  }
  const n = checked(LIMITS.points, r.points);
  const axisValue = r.speedAxis ?? "equivalent";
  if (axisValue !== "equivalent" && axisValue !== "true") {
    throw new AeroInputError("speedAxis", 'speedAxis must be "equivalent" or "true"', r.speedAxis);
  }
  return { min, max, n, axis: axisValue };
}

function toPlain(set: CurveSet<Float64Array>): CurveSet<number[]> {
  return {
    speedAxis: set.speedAxis,
    points: set.points,
    speedsMs: Array.from(set.speedsMs),
    cases: set.cases.map((c) => ({
      trueAirspeedMs: Array.from(c.trueAirspeedMs),
      zeroLiftDragN: Array.from(c.zeroLiftDragN),
      liftDependentDragN: Array.from(c.liftDependentDragN),
      idealInducedDragN: Array.from(c.idealInducedDragN),
      liftDependentIncrementN: Array.from(c.liftDependentIncrementN),
      totalDragN: Array.from(c.totalDragN),
      powerRequiredW: Array.from(c.powerRequiredW),
      liftToDrag: Array.from(c.liftToDrag),
      markers: { ...c.markers },
    })),
  };
}

/**
 * Samples, for every case, the zero-lift, lift-dependent (ideal induced +
 * increment), total drag, power required and L/D at `range.points` evenly
 * spaced speeds. Throws AeroInputError (with `path` ["cases", i, field]) for
 * an invalid case or range.
 */
export function sampleCurves(cases: readonly CurveCase[], range: CurveRange): CurveSet<Float64Array>;
export function sampleCurves(
  cases: readonly CurveCase[],
  range: CurveRange,
  options: SampleCurvesOptions & { arrays: "plain" },
): CurveSet<number[]>;
export function sampleCurves(
  cases: readonly CurveCase[],
  range: CurveRange,
  options: SampleCurvesOptions & { arrays?: "typed" },
): CurveSet<Float64Array>;
export function sampleCurves(
  cases: readonly CurveCase[],
  range: CurveRange,
  options?: SampleCurvesOptions,
): CurveSet<Float64Array> | CurveSet<number[]> {
  if (!Array.isArray(cases)) throw new AeroInputError("cases", "cases must be an array", cases);
  const { min, max, n, axis } = validateRange(range);
  const caseCount = cases.length;
  const reuse = options?.arrays === "plain" ? undefined : options?.reuse;
  let set: CurveSet<Float64Array>;
  if (shapeMatches(reuse, caseCount, n)) {
    set = reuse;
    set.speedAxis = axis;
  } else {
    const fresh: CaseCurves<Float64Array>[] = new Array<CaseCurves<Float64Array>>(caseCount);
    for (let c = 0; c < caseCount; c++) fresh[c] = newCaseCurves(n);
    set = { speedAxis: axis, points: n, speedsMs: new Float64Array(n), cases: fresh };
  }

  const speeds = set.speedsMs;
  const step = (max - min) / (n - 1);
  for (let i = 0; i < n - 1; i++) speeds[i] = min + i * step;
  speeds[n - 1] = max;

  for (let c = 0; c < caseCount; c++) {
    let s: LevelFlightState;
    try {
      const input = requireObject(cases[c], "case") as unknown as CurveCase;
      s = levelFlightState(input.aircraft, input);
    } catch (error) {
      // Locate the bad field in the case list (built only on failure, so valid calls allocate nothing here).
      if (error instanceof AeroInputError) throw new AeroInputError(error.field, error.message, error.value, ["cases", c, ...error.path]);
      throw error;
    }
    const out = set.cases[c] as CaseCurves<Float64Array>;

    const toTas = axis === "true" ? 1 : s.tasPerEas;
    const lift = s.liftN;
    const halfRhoS = 0.5 * s.densityKgM3 * s.wingAreaM2;
    // D(V) = a V^2 + (bIdeal + bIncrement) / V^2 in level flight.
    const a = halfRhoS * s.zeroLiftDragCoefficient;
    const bIdeal = (s.kIdeal * lift * lift) / halfRhoS;
    const bIncrement = (s.kIncrement * lift * lift) / halfRhoS;

    const tas = out.trueAirspeedMs;
    const zl = out.zeroLiftDragN;
    const ld = out.liftDependentDragN;
    const ideal = out.idealInducedDragN;
    const inc = out.liftDependentIncrementN;
    const total = out.totalDragN;
    const power = out.powerRequiredW;
    const l2d = out.liftToDrag;
    for (let i = 0; i < n; i++) {
      const v = (speeds[i] as number) * toTas;
      const v2 = v * v;
      const inv = 1 / v2;
      const dz = a * v2;
      const di = bIdeal * inv;
      const dinc = bIncrement * inv;
      const dl = di + dinc;
      const d = dz + dl;
      tas[i] = v;
      zl[i] = dz;
      ideal[i] = di;
      inc[i] = dinc;
      ld[i] = dl;
      total[i] = d;
      power[i] = d * v;
      l2d[i] = lift / d;
    }

    // Characteristic speeds on the axis's scale.
    const toAxis = axis === "true" ? s.tasPerEas : 1;
    const vmdEas = Math.sqrt((2 * lift) / (SEA_LEVEL_DENSITY_KG_M3 * s.wingAreaM2 * Math.sqrt(s.zeroLiftDragCoefficient / s.k)));
    const m = out.markers;
    m.minimumDragSpeedMs = vmdEas * toAxis;
    m.minimumPowerSpeedMs = (vmdEas / FOURTH_ROOT_OF_THREE) * toAxis;
    m.stallSpeedMs = Math.sqrt((2 * lift) / (SEA_LEVEL_DENSITY_KG_M3 * s.wingAreaM2 * s.maxLiftCoefficient)) * toAxis;
    m.maxLiftToDrag = 1 / (2 * Math.sqrt(s.zeroLiftDragCoefficient * s.k));
  }

  return options?.arrays === "plain" ? toPlain(set) : set;
}
