/**
 * An aeroplane as the library sees it, in SI units. The drag polar is
 * CD = zeroLiftDragCoefficient + k CL^2 with k = 1 / (pi e AR), AR = span^2 / area.
 * A configuration (gear, flaps) is simply another Aircraft with its own
 * zeroLiftDragCoefficient and maxLiftCoefficient.
 */
export interface Aircraft {
  /** Mass, kg; the weight is mass x 9.80665 m/s^2. */
  massKg: number;
  /** Reference wing area S, m^2. */
  wingAreaM2: number;
  /** Wing span b, m. */
  wingSpanM: number;
  /** Zero-lift drag coefficient CD0 (parasite drag coefficient). */
  zeroLiftDragCoefficient: number;
  /** Oswald efficiency e, in (0, 1]. */
  oswaldEfficiency: number;
  /** Maximum lift coefficient CLmax of this configuration. */
  maxLiftCoefficient: number;
}

/** Where the air is: geopotential (pressure) altitude and ISA temperature deviation. */
export interface AtmosphereConditions {
  /** Pressure altitude (geopotential), m, -610 … 20,000. */
  altitudeM: number;
  /** ISA temperature deviation, K (default 0). */
  isaDeviationK?: number | undefined;
}

/** Level flight at a load factor n (lift = n x weight; n = 1 in straight flight, 1/cos(bank) in a level turn). */
export interface LevelFlightConditions extends AtmosphereConditions {
  /** Load factor n (default 1). */
  loadFactor?: number | undefined;
}

/** Level flight at a given true airspeed. */
export interface SpeedConditions extends LevelFlightConditions {
  /** True airspeed, m/s. */
  trueAirspeedMs: number;
}

/** The general conditions shape accepted by the zod schema (every speed-dependent call needs trueAirspeedMs). */
export interface FlightConditions extends LevelFlightConditions {
  trueAirspeedMs?: number | undefined;
}
