import { atmosphereInputs, SEA_LEVEL_DENSITY_KG_M3, densityRatioUnchecked } from "./atmosphere";
import { AeroInputError } from "./errors";
import { LIMITS, checked, checkedOptional, describeAspectRatioProblem, requireObject } from "./limits";
import type { Aircraft, LevelFlightConditions, SpeedConditions } from "./types";
import { STANDARD_GRAVITY_MS2 } from "./units";

/** Aspect ratio AR = b^2 / S (span b in m, area S in m^2). */
export function aspectRatio(wingSpanM: number, wingAreaM2: number): number {
  const b = checked(LIMITS.wingSpanM, wingSpanM);
  const s = checked(LIMITS.wingAreaM2, wingAreaM2);
  return (b * b) / s;
}

/** Lift-dependent drag factor k = 1 / (pi e AR) of the parabolic polar CD = CD0 + k CL^2. */
export function inducedDragFactor(aspectRatioValue: number, oswaldEfficiency: number): number {
  const ar = checked(LIMITS.aspectRatio, aspectRatioValue);
  const e = checked(LIMITS.oswaldEfficiency, oswaldEfficiency);
  return 1 / (Math.PI * e * ar);
}

function sub(path: readonly (string | number)[] | undefined, field: string): readonly (string | number)[] | undefined {
  return path ? [...path, field] : undefined;
}

/** Validates every field of an aircraft; throws AeroInputError naming the first bad field. */
export function validateAircraft(aircraft: unknown, path?: readonly (string | number)[]): Aircraft {
  const a = requireObject(aircraft, "aircraft", path);
  const massKg = checked(LIMITS.massKg, a.massKg, "massKg", sub(path, "massKg"));
  const wingAreaM2 = checked(LIMITS.wingAreaM2, a.wingAreaM2, "wingAreaM2", sub(path, "wingAreaM2"));
  const wingSpanM = checked(LIMITS.wingSpanM, a.wingSpanM, "wingSpanM", sub(path, "wingSpanM"));
  const zeroLiftDragCoefficient = checked(
    LIMITS.zeroLiftDragCoefficient,
    a.zeroLiftDragCoefficient,
    "zeroLiftDragCoefficient",
    sub(path, "zeroLiftDragCoefficient"),
  );
  const oswaldEfficiency = checked(LIMITS.oswaldEfficiency, a.oswaldEfficiency, "oswaldEfficiency", sub(path, "oswaldEfficiency"));
  const maxLiftCoefficient = checked(
    LIMITS.maxLiftCoefficient,
    a.maxLiftCoefficient,
    "maxLiftCoefficient",
    sub(path, "maxLiftCoefficient"),
  );
  const arProblem = describeAspectRatioProblem(wingSpanM, wingAreaM2);
  if (arProblem !== null) {
    throw new AeroInputError("wingSpanM", arProblem, wingSpanM, sub(path, "wingSpanM") ?? ["wingSpanM"]);
  }
  return { massKg, wingAreaM2, wingSpanM, zeroLiftDragCoefficient, oswaldEfficiency, maxLiftCoefficient };
}

/**
 * Everything the polar needs at one altitude, computed once per aircraft and
 * condition (the curve sampler reuses it for every speed).
 */
export interface LevelFlightState {
  /** Lift L = n W, N. */
  liftN: number;
  /** Density ratio sigma. */
  densityRatio: number;
  /** Density rho, kg/m^3. */
  densityKgM3: number;
  wingAreaM2: number;
  zeroLiftDragCoefficient: number;
  maxLiftCoefficient: number;
  /** k = 1 / (pi e AR). */
  k: number;
  /** k of the ideal (elliptic, e = 1) wing, 1 / (pi AR). */
  kIdeal: number;
  /** k - kIdeal = kIdeal (1/e - 1), never negative. */
  kIncrement: number;
  /** 1 / sqrt(sigma): TAS = EAS x this. */
  tasPerEas: number;
}

/** Validates an aircraft and level-flight conditions and precomputes the polar constants. */
export function levelFlightState(
  aircraft: unknown,
  conditions: unknown,
  path?: readonly (string | number)[],
): LevelFlightState {
  const a = validateAircraft(aircraft, path);
  const c = requireObject(conditions, "conditions", path) as unknown as LevelFlightConditions;
  const { altitudeM, isaDeviationK } = atmosphereInputs(c, path);
  const n = checkedOptional(LIMITS.loadFactor, c.loadFactor, 1, sub(path, "loadFactor"));
  const sigma = densityRatioUnchecked(altitudeM, isaDeviationK);
  const ar = (a.wingSpanM * a.wingSpanM) / a.wingAreaM2;
  const kIdeal = 1 / (Math.PI * ar);
  const kIncrement = kIdeal * (1 / a.oswaldEfficiency - 1);
  return {
    liftN: n * a.massKg * STANDARD_GRAVITY_MS2,
    densityRatio: sigma,
    densityKgM3: sigma * SEA_LEVEL_DENSITY_KG_M3,
    wingAreaM2: a.wingAreaM2,
    zeroLiftDragCoefficient: a.zeroLiftDragCoefficient,
    maxLiftCoefficient: a.maxLiftCoefficient,
    k: kIdeal / a.oswaldEfficiency,
    kIdeal,
    kIncrement,
    tasPerEas: 1 / Math.sqrt(sigma),
  };
}

export interface DragBreakdown {
  /** CL = L / (q S). */
  liftCoefficient: number;
  /** CD = CD0 + k CL^2. */
  dragCoefficient: number;
  /** q = rho V^2 / 2, Pa. */
  dynamicPressurePa: number;
  /** EAS = TAS sqrt(sigma), m/s. */
  equivalentAirspeedMs: number;
  /** Zero-lift (parasite) drag q S CD0, N. */
  zeroLiftDragN: number;
  /** Lift-dependent drag q S k CL^2, N (= idealInducedDragN + liftDependentIncrementN). */
  liftDependentDragN: number;
  /** Induced drag of an ideal elliptic wing of the same span (e = 1), N. */
  idealInducedDragN: number;
  /** The rest of the lift-dependent drag, from e < 1, N. */
  liftDependentIncrementN: number;
  /** Total drag = thrust required, N. */
  totalDragN: number;
  /** Power required D x TAS, W. */
  powerRequiredW: number;
  /** L / D. */
  liftToDrag: number;
}

/** Drag of a level-flight state at true airspeed v (no validation). */
export function dragOfState(s: LevelFlightState, v: number): DragBreakdown {
  const qS = 0.5 * s.densityKgM3 * v * v * s.wingAreaM2;
  const cl = s.liftN / qS;
  // L^2 / (q S) written as L x CL: no overflow, no subtraction.
  const liftTimesCl = s.liftN * cl;
  const zeroLiftDragN = qS * s.zeroLiftDragCoefficient;
  const idealInducedDragN = s.kIdeal * liftTimesCl;
  const liftDependentIncrementN = s.kIncrement * liftTimesCl;
  const liftDependentDragN = idealInducedDragN + liftDependentIncrementN;
  const totalDragN = zeroLiftDragN + liftDependentDragN;
  return {
    liftCoefficient: cl,
    dragCoefficient: totalDragN / qS,
    dynamicPressurePa: qS / s.wingAreaM2,
    equivalentAirspeedMs: v / s.tasPerEas,
    zeroLiftDragN,
    liftDependentDragN,
    idealInducedDragN,
    liftDependentIncrementN,
    totalDragN,
    powerRequiredW: totalDragN * v,
    liftToDrag: s.liftN / totalDragN,
  };
}

/**
 * Drag in level, unaccelerated flight at a true airspeed: lift coefficient,
 * zero-lift drag, lift-dependent drag (split into the ideal induced part and
 * the increment from e < 1), total drag, power required and L/D.
 */
export function dragAt(aircraft: Aircraft, conditions: SpeedConditions): DragBreakdown {
  const s = levelFlightState(aircraft, conditions);
  const v = checked(LIMITS.trueAirspeedMs, conditions.trueAirspeedMs);
  return dragOfState(s, v);
}
