import { LIMITS, checked } from "./limits";

/**
 * Unit conversions with the exact defined factors. Each converter accepts any
 * finite number with magnitude up to 1e300 (signs allowed, e.g. negative
 * altitudes; the bound keeps every result finite) and throws AeroInputError (field "value") otherwise.
 */

/** Standard acceleration of gravity, m/s^2 (exact, by definition). */
export const STANDARD_GRAVITY_MS2 = 9.80665;
/** 1 international knot = 1852 m per hour (exact). */
export const METRES_PER_SECOND_PER_KNOT = 1852 / 3600;
/** 1 international foot = 0.3048 m (exact). */
export const METRES_PER_FOOT = 0.3048;
/** 1 avoirdupois pound = 0.45359237 kg (exact). */
export const KILOGRAMS_PER_POUND = 0.45359237;
/** 1 pound-force = 1 lb x g0 = 4.4482216152605 N (exact). */
export const NEWTONS_PER_POUND_FORCE = KILOGRAMS_PER_POUND * STANDARD_GRAVITY_MS2;
/** 1 mechanical horsepower = 550 ft.lbf/s = 745.69987158227 W (exact). */
export const WATTS_PER_HORSEPOWER = 550 * METRES_PER_FOOT * NEWTONS_PER_POUND_FORCE;
/** 1 km/h = 1/3.6 m/s (exact). */
export const METRES_PER_SECOND_PER_KMH = 1000 / 3600;
/** 1 statute mile per hour = 1609.344 m per hour = 0.44704 m/s (exact). */
export const METRES_PER_SECOND_PER_MPH = 1609.344 / 3600;
/** 1 inch of mercury (conventional, 0 degC) = 3386.389 Pa, the aviation altimeter-setting unit. */
export const PASCALS_PER_INCH_OF_MERCURY = 3386.389;
/** 1 hectopascal = 100 Pa (exact). */
export const PASCALS_PER_HECTOPASCAL = 100;
/** 0 degC = 273.15 K (exact). */
export const KELVIN_AT_ZERO_CELSIUS = 273.15;

const V = LIMITS.value;

// Multiplying one way and dividing the other keeps round trips within one rounding.
export const ktToMs = (kt: number): number => checked(V, kt) * METRES_PER_SECOND_PER_KNOT;
export const msToKt = (ms: number): number => checked(V, ms) / METRES_PER_SECOND_PER_KNOT;
export const kmhToMs = (kmh: number): number => checked(V, kmh) * METRES_PER_SECOND_PER_KMH;
export const msToKmh = (ms: number): number => checked(V, ms) / METRES_PER_SECOND_PER_KMH;
export const mphToMs = (mph: number): number => checked(V, mph) * METRES_PER_SECOND_PER_MPH;
export const msToMph = (ms: number): number => checked(V, ms) / METRES_PER_SECOND_PER_MPH;
export const ftToM = (ft: number): number => checked(V, ft) * METRES_PER_FOOT;
export const mToFt = (m: number): number => checked(V, m) / METRES_PER_FOOT;
export const lbToKg = (lb: number): number => checked(V, lb) * KILOGRAMS_PER_POUND;
export const kgToLb = (kg: number): number => checked(V, kg) / KILOGRAMS_PER_POUND;
export const lbfToN = (lbf: number): number => checked(V, lbf) * NEWTONS_PER_POUND_FORCE;
export const nToLbf = (n: number): number => checked(V, n) / NEWTONS_PER_POUND_FORCE;
export const hpToW = (hp: number): number => checked(V, hp) * WATTS_PER_HORSEPOWER;
export const wToHp = (w: number): number => checked(V, w) / WATTS_PER_HORSEPOWER;
export const inHgToPa = (inHg: number): number => checked(V, inHg) * PASCALS_PER_INCH_OF_MERCURY;
export const paToInHg = (pa: number): number => checked(V, pa) / PASCALS_PER_INCH_OF_MERCURY;
export const hpaToPa = (hpa: number): number => checked(V, hpa) * PASCALS_PER_HECTOPASCAL;
export const paToHpa = (pa: number): number => checked(V, pa) / PASCALS_PER_HECTOPASCAL;
export const celsiusToKelvin = (c: number): number => checked(V, c) + KELVIN_AT_ZERO_CELSIUS;
export const kelvinToCelsius = (k: number): number => checked(V, k) - KELVIN_AT_ZERO_CELSIUS;
/** Weight force of a mass under standard gravity, N. */
export const massToWeightN = (kg: number): number => checked(V, kg) * STANDARD_GRAVITY_MS2;
