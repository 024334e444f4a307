import { SEA_LEVEL_DENSITY_KG_M3, standardAtmosphere } from "./atmosphere";
import { LIMITS, checked } from "./limits";
import { levelFlightState } from "./polar";
import type { Aircraft, SpeedConditions } from "./types";

/**
 * Where a result leaves the model's validity. The library still computes every
 * figure (the parabolic polar has no CL cap and no Mach terms); these flags say
 * when a screen must not show that figure bare. A parallel function, so every
 * existing result keeps its shape and callers that do not ask pay nothing.
 *
 * - `below_stall`: the lift coefficient needed for level flight, n W / (q S),
 *   is above CLmax, i.e. the speed is below the stall speed
 *   Vs = sqrt(2 n W / (rho S CLmax)) (the lift equation, REFERENCES.md §5.4).
 *   At exactly Vs (CL = CLmax) the result is still valid.
 * - `far_below_stall`: below a tenth of the stall speed (CL above 100 CLmax);
 *   there the 1/V^2 terms dominate and the figures mean nothing. Always comes
 *   with `below_stall`.
 * - `compressible`: Mach number above 0.3, where the incompressible model
 *   (no Mach effects on drag, EAS = CAS) stops being a fair approximation
 *   (common practice, REFERENCES.md §9.1). At exactly 0.3 the result is valid.
 */
export const VALIDITY_FLAGS = ["below_stall", "far_below_stall", "compressible"] as const;
export type ValidityFlag = (typeof VALIDITY_FLAGS)[number];

/** Short words a screen shows beside the number instead of a bare figure. */
export const VALIDITY_FLAG_TEXT: Record<ValidityFlag, string> = {
  below_stall: "below stall: model not valid",
  far_below_stall: "far below stall: meaningless",
  compressible: "above Mach 0.3: compressibility ignored",
};

/** Mach number above which the incompressible model is flagged (common practice). */
export const INCOMPRESSIBLE_MACH_LIMIT = 0.3;
/** Fraction of the stall speed below which a result is flagged `far_below_stall`. */
export const FAR_BELOW_STALL_FRACTION = 0.1;

export interface Validity {
  /** Empty when the result is inside the model's validity. */
  flags: ValidityFlag[];
  /** Lift coefficient needed for level flight, n W / (q S). */
  liftCoefficient: number;
  /** CLmax of the aircraft given. */
  maxLiftCoefficient: number;
  /** Speed over the stall speed at the same load factor (EAS / Vs as EAS; 1 at the stall). */
  speedOverStall: number;
  /** Mach number TAS / a (a at the temperature of the ISA deviation). */
  machNumber: number;
}

/**
 * Validity of a level-flight result at a true airspeed: whether it lies below the stall,
 * far below it, or above Mach 0.3. Same inputs (and the same AeroInputError on bad ones)
 * as `dragAt`.
 */
export function validity(aircraft: Aircraft, conditions: SpeedConditions): Validity {
  const s = levelFlightState(aircraft, conditions);
  const v = checked(LIMITS.trueAirspeedMs, conditions.trueAirspeedMs);
  const qS = 0.5 * s.densityKgM3 * v * v * s.wingAreaM2;
  const liftCoefficient = s.liftN / qS;
  const eas = v / s.tasPerEas;
  const stallEas = Math.sqrt((2 * s.liftN) / (SEA_LEVEL_DENSITY_KG_M3 * s.wingAreaM2 * s.maxLiftCoefficient));
  const speedOverStall = eas / stallEas;
  const machNumber = v / standardAtmosphere(conditions.altitudeM, conditions.isaDeviationK ?? 0).speedOfSoundMs;
  const flags: ValidityFlag[] = [];
  if (liftCoefficient > s.maxLiftCoefficient) flags.push("below_stall");
  if (speedOverStall < FAR_BELOW_STALL_FRACTION) flags.push("far_below_stall");
  if (machNumber > INCOMPRESSIBLE_MACH_LIMIT) flags.push("compressible");
  return { flags, liftCoefficient, maxLiftCoefficient: s.maxLiftCoefficient, speedOverStall, machNumber };
}

/** The flags' short words joined for a readout ("" when valid). */
export function validityText(flags: readonly ValidityFlag[]): string {
  // far_below_stall says more than below_stall: show only the stronger one
  const shown = flags.includes("far_below_stall") ? flags.filter((f) => f !== "below_stall") : flags;
  return shown.map((f) => VALIDITY_FLAG_TEXT[f]).join("; ");
}
