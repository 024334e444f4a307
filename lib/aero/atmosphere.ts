import { AeroInputError } from "./errors";
import { LIMITS, MAX_ALTITUDE_M, MIN_ALTITUDE_M, checked, checkedOptional } from "./limits";
import { STANDARD_GRAVITY_MS2 } from "./units";

/**
 * ICAO / ISO 2533 standard atmosphere (identical to the U.S. Standard
 * Atmosphere 1976 below 32 km), troposphere and the isothermal layer above
 * it, in geopotential altitude H (the pressure altitude aviation uses), from
 * -610 m (-2,000 ft) to 20,000 m.
 *
 * An ISA deviation dT shifts the temperature (T = T_std + dT) and therefore
 * the density and the speed of sound; the pressure stays the standard
 * pressure of the pressure altitude, as altimetry defines it.
 */

/** Defining constants of the standard atmosphere. */
export const ISA = Object.freeze({
  seaLevelTemperatureK: 288.15,
  seaLevelPressurePa: 101325,
  /**
   * Specific gas constant of dry air, J/(kg K), as ICAO Doc 7488/3 and ISO 2533 state it:
   * R* / M = 8.31432 / 0.02896442 = 287.05287 (US Std Atm 1976's M0 = 0.0289644 gives 287.0531; REFERENCES.md §1).
   */
  gasConstantJKgK: 287.05287,
  gravityMs2: STANDARD_GRAVITY_MS2,
  /** Troposphere lapse rate, K per metre of geopotential altitude. */
  lapseRateKPerM: 0.0065,
  tropopauseAltitudeM: 11000,
  tropopauseTemperatureK: 216.65,
  /** Ratio of specific heats of air. */
  heatCapacityRatio: 1.4,
  minAltitudeM: MIN_ALTITUDE_M,
  maxAltitudeM: MAX_ALTITUDE_M,
});

const T0 = ISA.seaLevelTemperatureK;
const P0 = ISA.seaLevelPressurePa;
const R = ISA.gasConstantJKgK;
const G0 = ISA.gravityMs2;
const LAPSE = ISA.lapseRateKPerM;
const H11 = ISA.tropopauseAltitudeM;
const T11 = ISA.tropopauseTemperatureK;
const GAMMA = ISA.heatCapacityRatio;

/** g0 / (R L) = 5.25588. */
const PRESSURE_EXPONENT = G0 / (R * LAPSE);
/** Scale height of the isothermal layer R T11 / g0, m. */
const ISOTHERMAL_SCALE_HEIGHT_M = (R * T11) / G0;

/** Sea-level density p0 / (R T0) = 1.225 kg/m^3 (within 1.5e-8). */
export const SEA_LEVEL_DENSITY_KG_M3 = P0 / (R * T0);
/** Pressure at the tropopause (11 km), 22,632.06 Pa. */
export const TROPOPAUSE_PRESSURE_PA = P0 * Math.pow(T11 / T0, PRESSURE_EXPONENT);
const TROPOPAUSE_DENSITY_KG_M3 = TROPOPAUSE_PRESSURE_PA / (R * T11);

export interface AtmosphereState {
  /** Outside air temperature, K (standard temperature plus the ISA deviation). */
  temperatureK: number;
  /** Static pressure, Pa (not changed by the ISA deviation). */
  pressurePa: number;
  /** Air density, kg/m^3. */
  densityKgM3: number;
  /** sigma = rho / rho0. */
  densityRatio: number;
  /** delta = p / p0. */
  pressureRatio: number;
  /** theta = T / T0. */
  temperatureRatio: number;
  /** a = sqrt(gamma R T), m/s. */
  speedOfSoundMs: number;
}

/** Standard temperature at geopotential altitude h (no validation). */
export function standardTemperatureUnchecked(altitudeM: number): number {
  return altitudeM <= H11 ? T0 - LAPSE * altitudeM : T11;
}

/** Standard pressure at geopotential altitude h (no validation). */
export function standardPressureUnchecked(altitudeM: number): number {
  if (altitudeM <= H11) {
    return P0 * Math.pow((T0 - LAPSE * altitudeM) / T0, PRESSURE_EXPONENT);
  }
  return TROPOPAUSE_PRESSURE_PA * Math.exp(-(altitudeM - H11) / ISOTHERMAL_SCALE_HEIGHT_M);
}

/** Density ratio sigma at altitude h with ISA deviation dT (no validation; used by hot loops). */
export function densityRatioUnchecked(altitudeM: number, isaDeviationK: number): number {
  const p = standardPressureUnchecked(altitudeM);
  const t = standardTemperatureUnchecked(altitudeM) + isaDeviationK;
  return p / (R * t) / SEA_LEVEL_DENSITY_KG_M3;
}

/**
 * Standard atmosphere at geopotential (pressure) altitude `altitudeM`, with an
 * optional ISA temperature deviation `isaDeviationK` (pressure unchanged).
 * Throws AeroInputError for altitudes outside -610 … 20,000 m or deviations
 * outside -100 … +100 K.
 */
export function standardAtmosphere(altitudeM: number, isaDeviationK = 0): AtmosphereState {
  const h = checked(LIMITS.altitudeM, altitudeM);
  const dT = checked(LIMITS.isaDeviationK, isaDeviationK);
  const temperatureK = standardTemperatureUnchecked(h) + dT;
  const pressurePa = standardPressureUnchecked(h);
  const densityKgM3 = pressurePa / (R * temperatureK);
  return {
    temperatureK,
    pressurePa,
    densityKgM3,
    densityRatio: densityKgM3 / SEA_LEVEL_DENSITY_KG_M3,
    pressureRatio: pressurePa / P0,
    temperatureRatio: temperatureK / T0,
    speedOfSoundMs: Math.sqrt(GAMMA * R * temperatureK),
  };
}

/** Pressure at the model's ceiling (20,000 m), the smallest pressure accepted. */
export const MIN_PRESSURE_PA = standardPressureUnchecked(MAX_ALTITUDE_M);
/** Pressure at the model's floor (-610 m), the largest pressure accepted. */
export const MAX_PRESSURE_PA = standardPressureUnchecked(MIN_ALTITUDE_M);

function altitudeFromPressureUnchecked(pressurePa: number): number {
  if (pressurePa >= TROPOPAUSE_PRESSURE_PA) {
    return (T0 / LAPSE) * (1 - Math.pow(pressurePa / P0, 1 / PRESSURE_EXPONENT));
  }
  return H11 + ISOTHERMAL_SCALE_HEIGHT_M * Math.log(TROPOPAUSE_PRESSURE_PA / pressurePa);
}

function clampAltitude(h: number): number {
  return h < MIN_ALTITUDE_M ? MIN_ALTITUDE_M : h > MAX_ALTITUDE_M ? MAX_ALTITUDE_M : h;
}

/**
 * Pressure altitude, m: the standard-atmosphere altitude whose pressure is
 * `pressurePa`. Accepts pressures between those of 20,000 m and -610 m.
 */
export function pressureAltitudeFromPressure(pressurePa: number): number {
  if (typeof pressurePa !== "number" || !Number.isFinite(pressurePa) || pressurePa <= 0) {
    throw new AeroInputError("pressurePa", "pressurePa must be a positive finite number", pressurePa);
  }
  if (pressurePa < MIN_PRESSURE_PA || pressurePa > MAX_PRESSURE_PA) {
    throw new AeroInputError(
      "pressurePa",
      `pressurePa must be between ${MIN_PRESSURE_PA.toFixed(2)} and ${MAX_PRESSURE_PA.toFixed(2)} Pa (pressure altitude ${MIN_ALTITUDE_M} to ${MAX_ALTITUDE_M} m)`,
      pressurePa,
    );
  }
  // The inverse is exact up to rounding; the clamp only absorbs that rounding at the two ends.
  return clampAltitude(altitudeFromPressureUnchecked(pressurePa));
}

/**
 * Pressure altitude, m, of a place at `elevationM` whose altimeter setting
 * (QNH) is `altimeterSettingPa`: PA = elevation + H_p(QNH), where H_p is the
 * pressure altitude of the QNH pressure (negative when QNH > 1013.25 hPa).
 */
export function pressureAltitudeFromAltimeterSetting(elevationM: number, altimeterSettingPa: number): number {
  const elevation = checked(LIMITS.elevationM, elevationM);
  if (typeof altimeterSettingPa !== "number" || !Number.isFinite(altimeterSettingPa) || altimeterSettingPa <= 0) {
    throw new AeroInputError("altimeterSettingPa", "altimeterSettingPa must be a positive finite number", altimeterSettingPa);
  }
  // Altimeter settings on Earth lie far inside this band (record values about 870 to 1084 hPa).
  if (altimeterSettingPa < 80000 || altimeterSettingPa > MAX_PRESSURE_PA) {
    throw new AeroInputError(
      "altimeterSettingPa",
      `altimeterSettingPa must be between 80000 and ${MAX_PRESSURE_PA.toFixed(2)} Pa`,
      altimeterSettingPa,
    );
  }
  const pa = elevation + altitudeFromPressureUnchecked(altimeterSettingPa);
  if (pa < MIN_ALTITUDE_M || pa > MAX_ALTITUDE_M) {
    throw new AeroInputError(
      "elevationM",
      `elevationM with this altimeter setting gives a pressure altitude of ${pa.toFixed(0)} m, outside ${MIN_ALTITUDE_M} to ${MAX_ALTITUDE_M} m`,
      elevationM,
    );
  }
  return pa;
}

/** Standard-atmosphere altitude whose density is `densityKgM3` (no validation; may lie below -610 m). */
function altitudeFromDensityUnchecked(densityKgM3: number): number {
  if (densityKgM3 >= TROPOPAUSE_DENSITY_KG_M3) {
    // rho/rho0 = theta^(g0/(R L) - 1) in the troposphere.
    const theta = Math.pow(densityKgM3 / SEA_LEVEL_DENSITY_KG_M3, 1 / (PRESSURE_EXPONENT - 1));
    return (T0 / LAPSE) * (1 - theta);
  }
  return H11 + ISOTHERMAL_SCALE_HEIGHT_M * Math.log(TROPOPAUSE_DENSITY_KG_M3 / densityKgM3);
}

/**
 * Density altitude, m: the standard-atmosphere altitude with the same air
 * density as at pressure altitude `pressureAltitudeM` with outside air
 * temperature `outsideAirTemperatureK`.
 *
 * A cold day can give a density altitude below -610 m; the troposphere law is
 * then extrapolated downward (as density-altitude charts do). A result above
 * 20,000 m throws, because the layer above 20 km is not modelled.
 */
export function densityAltitude(pressureAltitudeM: number, outsideAirTemperatureK: number): number {
  const h = checked(LIMITS.altitudeM, pressureAltitudeM, "pressureAltitudeM");
  const oat = checked(LIMITS.outsideAirTemperatureK, outsideAirTemperatureK);
  const rho = standardPressureUnchecked(h) / (R * oat);
  const da = altitudeFromDensityUnchecked(rho);
  if (da > MAX_ALTITUDE_M) {
    throw new AeroInputError(
      "outsideAirTemperatureK",
      `outsideAirTemperatureK gives a density altitude of ${da.toFixed(0)} m, above the model ceiling of ${MAX_ALTITUDE_M} m`,
      outsideAirTemperatureK,
    );
  }
  return da;
}

/** Standard temperature, K, at geopotential altitude `altitudeM` (validated). */
export function standardTemperature(altitudeM: number): number {
  return standardTemperatureUnchecked(checked(LIMITS.altitudeM, altitudeM));
}

/** Validated density ratio sigma for a conditions-like object (altitudeM, optional isaDeviationK). */
export function densityRatioOf(
  conditions: { altitudeM: number; isaDeviationK?: number | undefined },
  prefix?: readonly (string | number)[],
): number {
  const h = checked(LIMITS.altitudeM, conditions.altitudeM, "altitudeM", prefix);
  const dT = checkedOptional(LIMITS.isaDeviationK, conditions.isaDeviationK, 0, prefix);
  return densityRatioUnchecked(h, dT);
}
