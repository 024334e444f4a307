import fc from "fast-check";
import { LIMITS, STANDARD_GRAVITY_MS2, ftToM, lbToKg, type Aircraft } from "@/lib/aero";

/** Aircraft from a weight in newtons. */
export function fromWeight(weightN: number, rest: Omit<Aircraft, "massKg">): Aircraft {
  return { massKg: weightN / STANDARD_GRAVITY_MS2, ...rest };
}

/**
 * Anderson, Introduction to Flight, 8th ed., ch. 6, "CP-1" (a light single-engine
 * aeroplane), REFERENCES.md §5.1: b = 10.912 m, S = 16.165 m2, W = 13127.5 N,
 * CD0 = 0.025, e = 0.8. CLmax is not part of the example (1.6 is a placeholder,
 * unused by the polar checks).
 */
export const CP1: Aircraft = fromWeight(13127.5, {
  wingAreaM2: 16.165,
  wingSpanM: 10.912,
  zeroLiftDragCoefficient: 0.025,
  oswaldEfficiency: 0.8,
  maxLiftCoefficient: 1.6,
});

/**
 * Anderson, Introduction to Flight, 8th ed., ch. 6, "CJ-1" (a business jet),
 * REFERENCES.md §6B: b = 16.25 m, S = 29.54 m2, W = 88176.75 N, CD0 = 0.02,
 * e = 0.81 (CLmax placeholder).
 */
export const CJ1: Aircraft = fromWeight(88176.75, {
  wingAreaM2: 29.54,
  wingSpanM: 16.25,
  zeroLiftDragCoefficient: 0.02,
  oswaldEfficiency: 0.81,
  maxLiftCoefficient: 1.6,
});

/**
 * A polar given directly (our example, REFERENCES.md §6C): CD = 0.025 + 0.0415 CL^2,
 * W = 3500 lb, S = 150 ft2, standard sea level. k is used directly: e = 1 and the
 * span is chosen so that 1/(pi AR) = 0.0415. Only W, S, CD0 and k enter the checks.
 */
const GIVEN_K = 0.0415;
const GIVEN_AREA_M2 = ftToM(1) * ftToM(1) * 150;
export const GIVEN_POLAR: Aircraft = {
  massKg: lbToKg(3500),
  wingAreaM2: GIVEN_AREA_M2,
  wingSpanM: Math.sqrt(GIVEN_AREA_M2 / (Math.PI * GIVEN_K)),
  zeroLiftDragCoefficient: 0.025,
  oswaldEfficiency: 1,
  maxLiftCoefficient: 1.6,
};

/**
 * A jet of our own (REFERENCES.md §6D): m = 45,000 kg, S = 160 m2, AR = 7,
 * CD0 = 0.020 and k = 1/(pi AR) (e = 1), CLmax = 1.5, flown at 9000 m.
 */
export const JET_OF_OUR_OWN: Aircraft = {
  massKg: 45000,
  wingAreaM2: 160,
  wingSpanM: Math.sqrt(7 * 160),
  zeroLiftDragCoefficient: 0.02,
  oswaldEfficiency: 1,
  maxLiftCoefficient: 1.5,
};

/**
 * A light aeroplane of our own (REFERENCES.md §6H, Derived answers):
 * W = 12,500 N, S = 20 m2, AR = 6, e = 0.9, CD0 = 0.02, sea level.
 */
export const LIGHT_OF_OUR_OWN: Aircraft = fromWeight(12500, {
  wingAreaM2: 20,
  wingSpanM: Math.sqrt(6 * 20),
  zeroLiftDragCoefficient: 0.02,
  oswaldEfficiency: 0.9,
  maxLiftCoefficient: 1.6,
});

// ---------------------------------------------------------------- fast-check arbitraries

function inRange(lim: { min: number; max: number }) {
  return fc.double({ min: lim.min, max: lim.max, noNaN: true, noDefaultInfinity: true });
}

/** Spread over orders of magnitude (log-uniform) inside [min, max]. */
function logRange(min: number, max: number) {
  return fc
    .double({ min: Math.log(min), max: Math.log(max), noNaN: true, noDefaultInfinity: true })
    .map((x) => Math.min(max, Math.max(min, Math.exp(x))));
}

/** Any aircraft the library accepts: every field across its whole valid range (aspect ratio 1 … 50). */
export const anyAircraft: fc.Arbitrary<Aircraft> = fc
  .record({
    massKg: logRange(LIMITS.massKg.min, LIMITS.massKg.max),
    wingAreaM2: logRange(LIMITS.wingAreaM2.min, LIMITS.wingAreaM2.max),
    aspectRatio: logRange(LIMITS.aspectRatio.min, LIMITS.aspectRatio.max),
    zeroLiftDragCoefficient: logRange(LIMITS.zeroLiftDragCoefficient.min, LIMITS.zeroLiftDragCoefficient.max),
    oswaldEfficiency: inRange(LIMITS.oswaldEfficiency),
    maxLiftCoefficient: inRange(LIMITS.maxLiftCoefficient),
  })
  .map(({ aspectRatio, ...rest }) => ({ ...rest, wingSpanM: Math.sqrt(aspectRatio * rest.wingAreaM2) }))
  .filter(
    (a) =>
      a.wingSpanM >= LIMITS.wingSpanM.min &&
      a.wingSpanM <= LIMITS.wingSpanM.max &&
      (a.wingSpanM * a.wingSpanM) / a.wingAreaM2 >= LIMITS.aspectRatio.min &&
      (a.wingSpanM * a.wingSpanM) / a.wingAreaM2 <= LIMITS.aspectRatio.max,
  );

/** Aircraft of the sizes Chalkwing's demos use: gliders to transports, realistic coefficients. */
export const realisticAircraft: fc.Arbitrary<Aircraft> = fc
  .record({
    massKg: logRange(200, 400_000),
    wingLoadingKgM2: fc.double({ min: 20, max: 700, noNaN: true }),
    aspectRatio: fc.double({ min: 4, max: 30, noNaN: true }),
    zeroLiftDragCoefficient: fc.double({ min: 0.008, max: 0.08, noNaN: true }),
    oswaldEfficiency: fc.double({ min: 0.5, max: 1, noNaN: true }),
    maxLiftCoefficient: fc.double({ min: 1, max: 3, noNaN: true }),
  })
  .map(({ wingLoadingKgM2, aspectRatio, ...rest }) => {
    const wingAreaM2 = rest.massKg / wingLoadingKgM2;
    return { ...rest, wingAreaM2, wingSpanM: Math.sqrt(aspectRatio * wingAreaM2) };
  })
  .filter((a) => a.wingAreaM2 >= 0.01 && a.wingAreaM2 <= 2000 && a.wingSpanM >= 0.1 && a.wingSpanM <= 200);

export const anyAltitude = inRange(LIMITS.altitudeM);
export const anyIsaDeviation = inRange(LIMITS.isaDeviationK);
export const anyLoadFactor = inRange(LIMITS.loadFactor);
export const anySpeed = logRange(LIMITS.trueAirspeedMs.min, LIMITS.trueAirspeedMs.max);
