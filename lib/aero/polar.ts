import { SEA_LEVEL_DENSITY_KG_M3, densityRatioOf } from "./atmosphere";
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

/**
 * Checks every field of an aircraft in place (no copy); throws AeroInputError
 * naming the first bad field. `prefix` locates the aircraft in a larger input.
 */
export function assertAircraft(aircraft: unknown, prefix?: readonly (string | number)[]): asserts aircraft is Aircraft {
  const a = requireObject(aircraft, "aircraft", prefix);
  checked(LIMITS.massKg, a.massKg, "massKg", prefix);
  const wingAreaM2 = checked(LIMITS.wingAreaM2, a.wingAreaM2, "wingAreaM2", prefix);
  const wingSpanM = checked(LIMITS.wingSpanM, a.wingSpanM, "wingSpanM", prefix);
  checked(LIMITS.zeroLiftDragCoefficient, a.zeroLiftDragCoefficient, "zeroLiftDragCoefficient", prefix);
  checked(LIMITS.oswaldEfficiency, a.oswaldEfficiency, "oswaldEfficiency", prefix);
  checked(LIMITS.maxLiftCoefficient, a.maxLiftCoefficient, "maxLiftCoefficient", prefix);
  const ar = (wingSpanM * wingSpanM) / wingAreaM2;
  if (!(ar >= LIMITS.aspectRatio.min && ar <= LIMITS.aspectRatio.max)) {
    const message = describeAspectRatioProblem(wingSpanM, wingAreaM2) ?? "wingSpanM gives an invalid aspect ratio";
    throw new AeroInputError("wingSpanM", message, wingSpanM, prefix ? [...prefix, "wingSpanM"] : ["wingSpanM"]);
  }
}

/** Validates every field of an aircraft and returns a clean copy; throws AeroInputError naming the first bad field. */
export function validateAircraft(aircraft: unknown): Aircraft {
  assertAircraft(aircraft);
  const { massKg, wingAreaM2, wingSpanM, zeroLiftDragCoefficient, oswaldEfficiency, maxLiftCoefficient } = aircraft;
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
export function levelFlightState(aircraft: unknown, conditions: unknown, prefix?: readonly (string | number)[]): LevelFlightState {
  assertAircraft(aircraft, prefix);
  const a = aircraft;
  const c = requireObject(conditions, "conditions", prefix) as unknown as LevelFlightConditions;
  const sigma = densityRatioOf(c, prefix);
  const n = checkedOptional(LIMITS.loadFactor, c.loadFactor, 1, prefix);
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
