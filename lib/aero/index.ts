/**
 * lib/aero: Chalkwing's drag-and-speed calculation library. Pure TypeScript,
 * SI units, no framework imports and no I/O, for the browser (live demos) and
 * the server (API routes, generated questions, mail). Import from here only;
 * the files behind this facade may move.
 *
 * Every function validates its inputs and throws AeroInputError (with a
 * `field`) instead of returning NaN or Infinity.
 */
export { AERO_LIBRARY_VERSION } from "./version";
export { AeroInputError, isAeroInputError } from "./errors";
export { LIMITS, type NumberLimit } from "./limits";
export type { Aircraft, AtmosphereConditions, LevelFlightConditions, SpeedConditions, FlightConditions } from "./types";

export {
  ISA,
  SEA_LEVEL_DENSITY_KG_M3,
  TROPOPAUSE_PRESSURE_PA,
  standardAtmosphere,
  standardTemperature,
  pressureAltitudeFromPressure,
  pressureAltitudeFromAltimeterSetting,
  densityAltitude,
  type AtmosphereState,
} from "./atmosphere";

export { equivalentToTrue, trueToEquivalent, machNumber } from "./airspeed";

export {
  STANDARD_GRAVITY_MS2,
  METRES_PER_SECOND_PER_KNOT,
  METRES_PER_FOOT,
  KILOGRAMS_PER_POUND,
  NEWTONS_PER_POUND_FORCE,
  WATTS_PER_HORSEPOWER,
  METRES_PER_SECOND_PER_KMH,
  METRES_PER_SECOND_PER_MPH,
  PASCALS_PER_INCH_OF_MERCURY,
  ktToMs,
  msToKt,
  kmhToMs,
  msToKmh,
  mphToMs,
  msToMph,
  ftToM,
  mToFt,
  lbToKg,
  kgToLb,
  lbfToN,
  nToLbf,
  hpToW,
  wToHp,
  inHgToPa,
  paToInHg,
  hpaToPa,
  paToHpa,
  celsiusToKelvin,
  kelvinToCelsius,
  massToWeightN,
} from "./units";

export { aspectRatio, inducedDragFactor, dragAt, validateAircraft, assertAircraft, type DragBreakdown } from "./polar";

export {
  FOURTH_ROOT_OF_THREE,
  minimumDragSpeed,
  minimumPowerSpeed,
  jetBestRangeSpeed,
  stallSpeed,
  bestGlide,
  glideDistance,
  maxLiftToDrag,
  loadFactorForBank,
  type MinimumDragSpeed,
  type MinimumPowerSpeed,
  type JetBestRangeSpeed,
  type StallSpeed,
  type BestGlide,
  type GlideDistance,
} from "./speeds";

export {
  NEUTRAL_BAND_FRACTION,
  speedStability,
  speedChangeResponse,
  type SpeedStability,
  type SpeedStabilityRegime,
  type StabilityCurve,
  type SpeedChangeResponse,
  type SpeedChangeTendency,
} from "./stability";

export {
  sampleCurves,
  type CurveCase,
  type CurveRange,
  type CurveSet,
  type CaseCurves,
  type CaseMarkers,
  type SpeedAxis,
  type SampleCurvesOptions,
} from "./curves";

export {
  VALIDITY_FLAGS,
  VALIDITY_FLAG_TEXT,
  INCOMPRESSIBLE_MACH_LIMIT,
  FAR_BELOW_STALL_FRACTION,
  validity,
  validityText,
  type Validity,
  type ValidityFlag,
} from "./validity";

export { vmdMassScaling, vmdZeroLiftDragScaling, trueAirspeedFactor } from "./sensitivities";

export {
  aircraftSchema,
  atmosphereConditionsSchema,
  flightConditionsSchema,
  speedConditionsSchema,
  curveCaseSchema,
  curveRangeSchema,
  type AircraftInput,
  type FlightConditionsInput,
  type SpeedConditionsInput,
  type CurveCaseInput,
  type CurveRangeInput,
} from "./schemas";
