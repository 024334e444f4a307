import { densityRatioUnchecked } from "./atmosphere";
import { LIMITS, checked } from "./limits";

/**
 * Factors the demos show, as closed forms of the parabolic polar in level flight:
 * - Vmd (EAS and TAS) grows with the square root of weight;
 * - a configuration change that raises CD0 lowers Vmd as CD0^(-1/4);
 * - at a fixed EAS, TAS grows as 1 / sqrt(sigma) with altitude.
 */

/** Vmd(new) / Vmd(old) when the mass changes by `massRatio` = new / old: sqrt(massRatio). */
export function vmdMassScaling(massRatio: number): number {
  return Math.sqrt(checked(LIMITS.ratio, massRatio, "massRatio"));
}

/** Vmd(new) / Vmd(old) when CD0 changes by `zeroLiftDragRatio` = new / old: ratio^(-1/4). */
export function vmdZeroLiftDragScaling(zeroLiftDragRatio: number): number {
  return Math.pow(checked(LIMITS.ratio, zeroLiftDragRatio, "zeroLiftDragRatio"), -0.25);
}

/** TAS / EAS at an altitude: 1 / sqrt(sigma). */
export function trueAirspeedFactor(altitudeM: number, isaDeviationK = 0): number {
  const h = checked(LIMITS.altitudeM, altitudeM);
  const dT = checked(LIMITS.isaDeviationK, isaDeviationK);
  return 1 / Math.sqrt(densityRatioUnchecked(h, dT));
}
