import { SEA_LEVEL_DENSITY_KG_M3 } from "./atmosphere";
import { LIMITS, checked, requireObject } from "./limits";
import { levelFlightState, validateAircraft, type LevelFlightState } from "./polar";
import type { Aircraft, AtmosphereConditions, LevelFlightConditions } from "./types";

/** 3^(1/4): Vmp = Vmd / 3^(1/4), jet best range speed = 3^(1/4) Vmd. */
export const FOURTH_ROOT_OF_THREE = Math.pow(3, 0.25);

/** EAS at which the lift coefficient is `cl` (lift L = n W), m/s. */
function easForLiftCoefficient(s: LevelFlightState, cl: number, liftN = s.liftN): number {
  return Math.sqrt((2 * liftN) / (SEA_LEVEL_DENSITY_KG_M3 * s.wingAreaM2 * cl));
}

/** (L/D)max = 1 / (2 sqrt(CD0 k)). */
function maxLiftToDragOf(s: LevelFlightState): number {
  return 1 / (2 * Math.sqrt(s.zeroLiftDragCoefficient * s.k));
}

export interface MinimumDragSpeed {
  /** Vmd as EAS (= IAS in this model), m/s; independent of altitude. */
  equivalentAirspeedMs: number;
  /** Vmd as TAS at the given altitude, m/s. */
  trueAirspeedMs: number;
  /** Minimum drag Dmin = L / (L/D)max, N. */
  totalDragN: number;
  /** At Vmd the zero-lift and lift-dependent drags are equal: Dmin / 2 each, N. */
  zeroLiftDragN: number;
  liftDependentDragN: number;
  /** (L/D)max = 1 / (2 sqrt(CD0 k)). */
  maxLiftToDrag: number;
  /** CL* = sqrt(CD0 / k). */
  liftCoefficient: number;
  /** Power required at Vmd, W. */
  powerRequiredW: number;
}

/**
 * Minimum-drag speed Vmd (the speed of (L/D)max): CL* = sqrt(CD0/k),
 * Vmd = sqrt(2 n W / (rho S CL*)).
 */
export function minimumDragSpeed(aircraft: Aircraft, conditions: LevelFlightConditions): MinimumDragSpeed {
  const s = levelFlightState(aircraft, conditions);
  const cl = Math.sqrt(s.zeroLiftDragCoefficient / s.k);
  const eas = easForLiftCoefficient(s, cl);
  const tas = eas * s.tasPerEas;
  const maxLiftToDrag = maxLiftToDragOf(s);
  const totalDragN = s.liftN / maxLiftToDrag;
  return {
    equivalentAirspeedMs: eas,
    trueAirspeedMs: tas,
    totalDragN,
    zeroLiftDragN: totalDragN / 2,
    liftDependentDragN: totalDragN / 2,
    maxLiftToDrag,
    liftCoefficient: cl,
    powerRequiredW: totalDragN * tas,
  };
}

export interface MinimumPowerSpeed {
  /** Vmp as EAS, m/s. */
  equivalentAirspeedMs: number;
  /** Vmp as TAS, m/s. */
  trueAirspeedMs: number;
  /** Minimum power required Pmin = D x TAS at Vmp, W. */
  powerRequiredW: number;
  /** Drag at Vmp (= 2/sqrt(3) Dmin), N. */
  totalDragN: number;
  /** L/D at Vmp (= sqrt(3)/2 (L/D)max). */
  liftToDrag: number;
  /** CL = sqrt(3 CD0 / k). */
  liftCoefficient: number;
}

/**
 * Minimum-power speed Vmp = Vmd / 3^(1/4) (CL = sqrt(3 CD0 / k), where the
 * lift-dependent drag is three times the zero-lift drag).
 */
export function minimumPowerSpeed(aircraft: Aircraft, conditions: LevelFlightConditions): MinimumPowerSpeed {
  const s = levelFlightState(aircraft, conditions);
  const cl = Math.sqrt((3 * s.zeroLiftDragCoefficient) / s.k);
  const eas = easForLiftCoefficient(s, cl);
  const tas = eas * s.tasPerEas;
  const liftToDrag = cl / (4 * s.zeroLiftDragCoefficient);
  const totalDragN = s.liftN / liftToDrag;
  return {
    equivalentAirspeedMs: eas,
    trueAirspeedMs: tas,
    powerRequiredW: totalDragN * tas,
    totalDragN,
    liftToDrag,
    liftCoefficient: cl,
  };
}

export interface JetBestRangeSpeed {
  equivalentAirspeedMs: number;
  trueAirspeedMs: number;
  /** L/D there (= sqrt(3)/2 (L/D)max). */
  liftToDrag: number;
  totalDragN: number;
  /** CL = sqrt(CD0 / (3 k)), where the zero-lift drag is three times the lift-dependent drag. */
  liftCoefficient: number;
}

/**
 * Best-range speed of a jet (thrust-specific fuel consumption constant): the
 * speed of minimum D / V, 3^(1/4) Vmd.
 */
export function jetBestRangeSpeed(aircraft: Aircraft, conditions: LevelFlightConditions): JetBestRangeSpeed {
  const s = levelFlightState(aircraft, conditions);
  const cl = Math.sqrt(s.zeroLiftDragCoefficient / (3 * s.k));
  const eas = easForLiftCoefficient(s, cl);
  const liftToDrag = cl / ((4 / 3) * s.zeroLiftDragCoefficient);
  return {
    equivalentAirspeedMs: eas,
    trueAirspeedMs: eas * s.tasPerEas,
    liftToDrag,
    totalDragN: s.liftN / liftToDrag,
    liftCoefficient: cl,
  };
}

export interface StallSpeed {
  /** Vs as EAS, m/s. */
  equivalentAirspeedMs: number;
  /** Vs as TAS, m/s. */
  trueAirspeedMs: number;
}

/** Stall speed Vs = sqrt(2 n W / (rho S CLmax)); at load factor n it is Vs(1g) sqrt(n). */
export function stallSpeed(aircraft: Aircraft, conditions: LevelFlightConditions): StallSpeed {
  const s = levelFlightState(aircraft, conditions);
  const eas = easForLiftCoefficient(s, s.maxLiftCoefficient);
  return { equivalentAirspeedMs: eas, trueAirspeedMs: eas * s.tasPerEas };
}

export interface BestGlide {
  /** Best-glide speed as EAS, m/s: Vmd sqrt(cos gamma), within 0.4 % of Vmd when (L/D)max > 8. */
  equivalentAirspeedMs: number;
  trueAirspeedMs: number;
  /** Glide ratio = (L/D)max (horizontal distance per unit height lost). */
  glideRatio: number;
  /** Glide path angle gamma = atan(1 / (L/D)max), rad. */
  glideAngleRad: number;
  /** Rate of descent TAS sin(gamma), m/s. */
  sinkRateMs: number;
}

/**
 * Best glide in still air: flown at CL* (the (L/D)max lift coefficient), so
 * the glide ratio is (L/D)max. In the steady glide L = W cos(gamma), so the
 * speed is Vmd sqrt(cos gamma), which is Vmd for all practical purposes.
 */
export function bestGlide(aircraft: Aircraft, conditions: AtmosphereConditions): BestGlide {
  const c = requireObject(conditions, "conditions");
  const s = levelFlightState(aircraft, { altitudeM: c.altitudeM, isaDeviationK: c.isaDeviationK });
  const cl = Math.sqrt(s.zeroLiftDragCoefficient / s.k);
  const glideRatio = maxLiftToDragOf(s);
  const gamma = Math.atan(1 / glideRatio);
  const eas = easForLiftCoefficient(s, cl, s.liftN * Math.cos(gamma));
  const tas = eas * s.tasPerEas;
  return {
    equivalentAirspeedMs: eas,
    trueAirspeedMs: tas,
    glideRatio,
    glideAngleRad: gamma,
    sinkRateMs: tas * Math.sin(gamma),
  };
}

export interface GlideDistance {
  /** Still-air horizontal distance = height x (L/D)max, m. */
  distanceM: number;
  glideRatio: number;
}

/** Still-air glide distance from `heightM` above the ground at best glide: h x (L/D)max. */
export function glideDistance(aircraft: Aircraft, conditions: { heightM: number }): GlideDistance {
  const a = validateAircraft(aircraft);
  const c = requireObject(conditions, "conditions");
  const h = checked(LIMITS.heightM, c.heightM);
  const ar = (a.wingSpanM * a.wingSpanM) / a.wingAreaM2;
  const k = 1 / (Math.PI * a.oswaldEfficiency * ar);
  const glideRatio = 1 / (2 * Math.sqrt(a.zeroLiftDragCoefficient * k));
  return { distanceM: h * glideRatio, glideRatio };
}

/** (L/D)max of an aircraft: 1 / (2 sqrt(CD0 k)); independent of weight and altitude. */
export function maxLiftToDrag(aircraft: Aircraft): number {
  return glideDistance(aircraft, { heightM: 0 }).glideRatio;
}

/** Load factor of a level turn at `bankAngleDeg` (0 … 84.26 deg, n = 1/cos(bank) up to 10). */
export function loadFactorForBank(bankAngleDeg: number): number {
  const lim = { ...LIMITS.loadFactor, field: "bankAngleDeg", min: 0, max: 84.26, unit: "deg", positive: false };
  const deg = checked(lim, bankAngleDeg);
  return 1 / Math.cos((deg * Math.PI) / 180);
}
