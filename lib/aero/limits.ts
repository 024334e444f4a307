import { AeroInputError } from "./errors";

/**
 * The valid range of every numeric input, in one table shared by the runtime
 * checks (which throw AeroInputError) and the zod schemas (which report the
 * same message), so a form, an API route and a live demo reject the same
 * values with the same words.
 *
 * The ranges are wide (model aircraft to the largest transports) and chosen
 * so that every output stays finite; they are not claims that the
 * incompressible, parabolic-polar model is accurate at the extremes (see
 * README.md).
 */
export interface NumberLimit {
  /** Name of the input as it appears in the library's types. */
  readonly field: string;
  /** Smallest allowed value (inclusive). */
  readonly min: number;
  /** Largest allowed value (inclusive). */
  readonly max: number;
  /** Unit shown in messages, "" for dimensionless. */
  readonly unit: string;
  /** True when zero and negative values are meaningless ("must be a positive finite number"). */
  readonly positive: boolean;
  /** True when the value must be a whole number. */
  readonly integer?: boolean;
}

function limit(field: string, min: number, max: number, unit: string, positive: boolean, integer = false): NumberLimit {
  return Object.freeze({ field, min, max, unit, positive, integer });
}

/** Geopotential (pressure) altitude range of the standard atmosphere model. */
export const MIN_ALTITUDE_M = -610;
export const MAX_ALTITUDE_M = 20000;

/** Speeds: the floor only keeps 1/V^2 terms finite; the ceiling is far beyond the incompressible range. */
export const MIN_SPEED_MS = 0.001;
export const MAX_SPEED_MS = 1000;

export const LIMITS = Object.freeze({
  massKg: limit("massKg", 0.1, 1_000_000, "kg", true),
  wingAreaM2: limit("wingAreaM2", 0.01, 2000, "m2", true),
  wingSpanM: limit("wingSpanM", 0.1, 200, "m", true),
  aspectRatio: limit("aspectRatio", 1, 50, "", true),
  zeroLiftDragCoefficient: limit("zeroLiftDragCoefficient", 0.001, 1, "", true),
  oswaldEfficiency: limit("oswaldEfficiency", 0.1, 1, "", true),
  maxLiftCoefficient: limit("maxLiftCoefficient", 0.1, 6, "", true),
  altitudeM: limit("altitudeM", MIN_ALTITUDE_M, MAX_ALTITUDE_M, "m", false),
  isaDeviationK: limit("isaDeviationK", -100, 100, "K", false),
  trueAirspeedMs: limit("trueAirspeedMs", MIN_SPEED_MS, MAX_SPEED_MS, "m/s", true),
  equivalentAirspeedMs: limit("equivalentAirspeedMs", MIN_SPEED_MS, MAX_SPEED_MS, "m/s", true),
  loadFactor: limit("loadFactor", 0.1, 10, "", true),
  heightM: limit("heightM", 0, 20000, "m", false),
  outsideAirTemperatureK: limit("outsideAirTemperatureK", 100, 400, "K", true),
  elevationM: limit("elevationM", MIN_ALTITUDE_M, MAX_ALTITUDE_M, "m", false),
  minSpeedMs: limit("minSpeedMs", MIN_SPEED_MS, MAX_SPEED_MS, "m/s", true),
  maxSpeedMs: limit("maxSpeedMs", MIN_SPEED_MS, MAX_SPEED_MS, "m/s", true),
  points: limit("points", 2, 10000, "", true, true),
  speedChangeMs: limit("speedChangeMs", -MAX_SPEED_MS, MAX_SPEED_MS, "m/s", false),
  ratio: limit("ratio", 1e-6, 1e6, "", true),
  /** Plain unit conversions accept any sign; the bound only keeps the result finite. */
  value: limit("value", -1e300, 1e300, "", false),
});

function formatBound(x: number): string {
  return String(x);
}

/** Why `value` violates `lim`, or null when it is valid. */
export function describeProblem(lim: NumberLimit, value: unknown, field: string = lim.field): string | null {
  if (typeof value !== "number" || !Number.isFinite(value) || (lim.positive && value <= 0)) {
    return lim.positive ? `${field} must be a positive finite number` : `${field} must be a finite number`;
  }
  if (value < lim.min || value > lim.max) {
    const unit = lim.unit === "" ? "" : ` ${lim.unit}`;
    return `${field} must be between ${formatBound(lim.min)} and ${formatBound(lim.max)}${unit}`;
  }
  if (lim.integer === true && !Number.isInteger(value)) {
    return `${field} must be a whole number`;
  }
  return null;
}

/**
 * Returns `value` as a number when it satisfies `lim`, otherwise throws an
 * AeroInputError naming the field. `prefix` locates the field inside a
 * larger input (the error's path is [...prefix, field]); nothing is
 * allocated unless the check fails.
 */
export function checked(lim: NumberLimit, value: unknown, field: string = lim.field, prefix?: readonly (string | number)[]): number {
  // Fast path first: the common valid case costs a few comparisons.
  if (typeof value === "number" && value >= lim.min && value <= lim.max && (lim.integer !== true || Number.isInteger(value))) {
    if (!lim.positive || value > 0) return value;
  }
  const message = describeProblem(lim, value, field);
  throw new AeroInputError(field, message ?? `${field} is invalid`, value, prefix ? [...prefix, field] : [field]);
}

/** Like `checked`, for optional inputs: undefined gives `fallback`. */
export function checkedOptional(lim: NumberLimit, value: unknown, fallback: number, prefix?: readonly (string | number)[]): number {
  return value === undefined ? fallback : checked(lim, value, lim.field, prefix);
}

/** Aspect-ratio message shared by the runtime check and the zod schema. */
export function describeAspectRatioProblem(wingSpanM: number, wingAreaM2: number): string | null {
  const ar = (wingSpanM * wingSpanM) / wingAreaM2;
  const lim = LIMITS.aspectRatio;
  if (Number.isFinite(ar) && ar >= lim.min && ar <= lim.max) return null;
  return `wingSpanM and wingAreaM2 give an aspect ratio of ${Number.isFinite(ar) ? ar.toPrecision(3) : String(ar)}; it must be between ${lim.min} and ${lim.max}`;
}

/** Throws AeroInputError(field "conditions" / "aircraft" …) unless `value` is a plain object. */
export function requireObject(value: unknown, field: string, prefix?: readonly (string | number)[]): Record<string, unknown> {
  if (typeof value !== "object" || value === null || Array.isArray(value)) {
    throw new AeroInputError(field, `${field} must be an object`, value, prefix ? [...prefix, field] : [field]);
  }
  return value as Record<string, unknown>;
}
