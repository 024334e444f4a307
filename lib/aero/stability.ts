import { SEA_LEVEL_DENSITY_KG_M3 } from "./atmosphere";
import { AeroInputError } from "./errors";
import { LIMITS, MAX_SPEED_MS, MIN_SPEED_MS, checked } from "./limits";
import { dragOfState, levelFlightState, type LevelFlightState } from "./polar";
import { FOURTH_ROOT_OF_THREE } from "./speeds";
import type { Aircraft, SpeedConditions } from "./types";

/**
 * Speed stability in level flight, on two curves that handbooks both use:
 *
 * - the drag (thrust-required) curve at constant thrust: above Vmd a speed
 *   increase raises drag above the thrust and the aeroplane slows back down
 *   (speed-stable); below Vmd it lowers drag and the speed keeps growing, and a
 *   decrease keeps decaying (speed-unstable, the region of reversed command);
 * - the power-required curve at constant power (propeller aeroplanes): the
 *   same reasoning with power, so the boundary is Vmp.
 *
 * Within 1 % of the boundary speed the regime is reported as neutral.
 */
export type SpeedStabilityRegime = "stable" | "neutral" | "unstable";

/** Which curve a regime was read from. */
export type StabilityCurve = "drag-at-constant-thrust" | "power-at-constant-power";

/** The neutral band: within this fraction of Vmd (or Vmp) the regime is "neutral". */
export const NEUTRAL_BAND_FRACTION = 0.01;

/** What follows a disturbance: "returns" to the trimmed speed, "diverges" from it, or "none" (no change). */
export type SpeedChangeTendency = "returns" | "diverges" | "none";

export interface SpeedChangeResponse {
  fromTrueAirspeedMs: number;
  toTrueAirspeedMs: number;
  speedChangeMs: number;
  /** Drag at the trimmed speed (= the thrust that stays set), N. */
  dragBeforeN: number;
  dragAfterN: number;
  /** dragAfter - dragBefore, N. */
  dragChangeN: number;
  /** Linear estimate dD/dV x dV, N (good for small changes). */
  linearDragChangeN: number;
  /** Thrust minus drag after the change (thrust held), N; positive accelerates. */
  excessThrustN: number;
  /** On the drag curve at constant thrust. */
  dragCurveTendency: SpeedChangeTendency;
  powerBeforeW: number;
  powerAfterW: number;
  powerChangeW: number;
  /** Power available minus power required after the change (power held), W; positive accelerates. */
  excessPowerW: number;
  /** On the power-required curve at constant power. */
  powerCurveTendency: SpeedChangeTendency;
}

export interface SpeedStability {
  /** Regime on the drag curve at constant thrust (boundary Vmd). */
  regime: SpeedStabilityRegime;
  regimeCurve: "drag-at-constant-thrust";
  /** dD/dV at this speed, N per m/s of TAS (negative below Vmd). */
  dragSlopeNPerMs: number;
  /** Vmd as TAS at these conditions, m/s. */
  minimumDragTrueAirspeedMs: number;
  /** V / Vmd. */
  speedToMinimumDragRatio: number;
  /** Regime on the power-required curve at constant power (boundary Vmp). */
  powerCurveRegime: SpeedStabilityRegime;
  powerCurveRegimeCurve: "power-at-constant-power";
  /** dP/dV at this speed, W per m/s of TAS (negative below Vmp). */
  powerSlopeWPerMs: number;
  /** Vmp as TAS at these conditions, m/s. */
  minimumPowerTrueAirspeedMs: number;
  /** V / Vmp. */
  speedToMinimumPowerRatio: number;
  /** Half-width of the neutral band as a fraction of the boundary speed (0.01). */
  neutralBandFraction: number;
  /** Present when conditions.speedChangeMs was given: what a gust of that size does. */
  speedChange?: SpeedChangeResponse;
}

function classify(ratio: number): SpeedStabilityRegime {
  if (Math.abs(ratio - 1) <= NEUTRAL_BAND_FRACTION) return "neutral";
  return ratio > 1 ? "stable" : "unstable";
}

function tendency(speedChange: number, excess: number): SpeedChangeTendency {
  const product = speedChange * excess;
  if (product < 0) return "returns";
  if (product > 0) return "diverges";
  return "none";
}

function vmdTas(s: LevelFlightState): number {
  const clStar = Math.sqrt(s.zeroLiftDragCoefficient / s.k);
  return Math.sqrt((2 * s.liftN) / (SEA_LEVEL_DENSITY_KG_M3 * s.wingAreaM2 * clStar)) * s.tasPerEas;
}

function responseOf(s: LevelFlightState, v: number, dv: number): SpeedChangeResponse {
  const to = v + dv;
  if (!(to >= MIN_SPEED_MS && to <= MAX_SPEED_MS)) {
    throw new AeroInputError(
      "speedChangeMs",
      `speedChangeMs takes the true airspeed to ${to.toPrecision(4)} m/s, outside ${MIN_SPEED_MS} to ${MAX_SPEED_MS} m/s`,
      dv,
    );
  }
  const before = dragOfState(s, v);
  const after = dragOfState(s, to);
  const slope = (2 * (before.zeroLiftDragN - before.liftDependentDragN)) / v;
  const excessThrustN = before.totalDragN - after.totalDragN;
  const excessPowerW = before.powerRequiredW - after.powerRequiredW;
  return {
    fromTrueAirspeedMs: v,
    toTrueAirspeedMs: to,
    speedChangeMs: dv,
    dragBeforeN: before.totalDragN,
    dragAfterN: after.totalDragN,
    dragChangeN: after.totalDragN - before.totalDragN,
    linearDragChangeN: slope * dv,
    excessThrustN,
    dragCurveTendency: tendency(dv, excessThrustN),
    powerBeforeW: before.powerRequiredW,
    powerAfterW: after.powerRequiredW,
    powerChangeW: after.powerRequiredW - before.powerRequiredW,
    excessPowerW,
    powerCurveTendency: tendency(dv, excessPowerW),
  };
}

/**
 * Speed stability at a true airspeed: the slope dD/dV = 2 (Dzero-lift -
 * Dlift-dependent) / V, the regime on the drag curve (constant thrust,
 * boundary Vmd) and on the power curve (constant power, boundary Vmp;
 * dP/dV = 3 Dzero-lift - Dlift-dependent). With `speedChangeMs` it also says
 * what a speed change of that size does.
 */
export function speedStability(aircraft: Aircraft, conditions: SpeedConditions & { speedChangeMs?: number | undefined }): SpeedStability {
  const s = levelFlightState(aircraft, conditions);
  const v = checked(LIMITS.trueAirspeedMs, conditions.trueAirspeedMs);
  const d = dragOfState(s, v);
  const vmd = vmdTas(s);
  const vmp = vmd / FOURTH_ROOT_OF_THREE;
  const result: SpeedStability = {
    regime: classify(v / vmd),
    regimeCurve: "drag-at-constant-thrust",
    dragSlopeNPerMs: (2 * (d.zeroLiftDragN - d.liftDependentDragN)) / v,
    minimumDragTrueAirspeedMs: vmd,
    speedToMinimumDragRatio: v / vmd,
    powerCurveRegime: classify(v / vmp),
    powerCurveRegimeCurve: "power-at-constant-power",
    powerSlopeWPerMs: 3 * d.zeroLiftDragN - d.liftDependentDragN,
    minimumPowerTrueAirspeedMs: vmp,
    speedToMinimumPowerRatio: v / vmp,
    neutralBandFraction: NEUTRAL_BAND_FRACTION,
  };
  if (conditions.speedChangeMs !== undefined) {
    result.speedChange = responseOf(s, v, checked(LIMITS.speedChangeMs, conditions.speedChangeMs));
  }
  return result;
}

/**
 * What a speed change `speedChangeMs` (e.g. a gust) does from a trimmed true
 * airspeed, with thrust (drag curve) or power (power curve) held constant.
 */
export function speedChangeResponse(aircraft: Aircraft, conditions: SpeedConditions, speedChangeMs: number): SpeedChangeResponse {
  const s = levelFlightState(aircraft, conditions);
  const v = checked(LIMITS.trueAirspeedMs, conditions.trueAirspeedMs);
  return responseOf(s, v, checked(LIMITS.speedChangeMs, speedChangeMs));
}
