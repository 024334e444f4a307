import { densityRatioUnchecked, standardAtmosphere } from "./atmosphere";
import { LIMITS, checked } from "./limits";

/**
 * Airspeeds. EAS = TAS sqrt(sigma). At the low Mach numbers of training
 * aircraft the library treats IAS = CAS = EAS (no position error, no
 * compressibility correction); see README.md for the size of that error.
 */

function sigmaOf(altitudeM: number, isaDeviationK: number): number {
  const h = checked(LIMITS.altitudeM, altitudeM);
  const dT = checked(LIMITS.isaDeviationK, isaDeviationK);
  return densityRatioUnchecked(h, dT);
}

/** TAS = EAS / sqrt(sigma), m/s. */
export function equivalentToTrue(equivalentAirspeedMs: number, altitudeM: number, isaDeviationK = 0): number {
  const eas = checked(LIMITS.equivalentAirspeedMs, equivalentAirspeedMs);
  return eas / Math.sqrt(sigmaOf(altitudeM, isaDeviationK));
}

/** EAS = TAS sqrt(sigma), m/s. */
export function trueToEquivalent(trueAirspeedMs: number, altitudeM: number, isaDeviationK = 0): number {
  const tas = checked(LIMITS.trueAirspeedMs, trueAirspeedMs);
  return tas * Math.sqrt(sigmaOf(altitudeM, isaDeviationK));
}

/** Mach number TAS / a, to judge whether the incompressible model still applies (M < 0.3 or so). */
export function machNumber(trueAirspeedMs: number, altitudeM: number, isaDeviationK = 0): number {
  const tas = checked(LIMITS.trueAirspeedMs, trueAirspeedMs);
  return tas / standardAtmosphere(altitudeM, isaDeviationK).speedOfSoundMs;
}
