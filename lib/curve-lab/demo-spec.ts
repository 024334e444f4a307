import {
  msToKt,
  ktToMs,
  minimumDragSpeed,
  stallSpeed,
  speedChangeResponse,
  equivalentToTrue,
  type Aircraft,
  type CurveCase,
} from "@/lib/aero";

/**
 * A demo's spec: what one demo revision shows. Pure (lib/aero only), shared by the builder in
 * the browser, the server actions that save it, the Projector view and the bench.
 * Speeds are stored in m/s; the axis unit only changes what is shown. No zod here, so the
 * builder's bundle stays small: the schema lives in schema.ts (forms and server), which the builder never imports.
 */

export const CONFIGURATION_KEYS = ["clean", "gearDown", "flaps1", "flaps2"] as const;
export type ConfigurationKey = (typeof CONFIGURATION_KEYS)[number];
export const CONFIGURATION_LABELS: Record<ConfigurationKey, string> = {
  clean: "Clean",
  gearDown: "Gear down",
  flaps1: "Flaps 1",
  flaps2: "Flaps 2",
};

/** One configuration's numbers: its zero-lift drag increment over clean and its CLmax. */
export interface ConfigurationValues {
  cd0Increment: number;
  maxLiftCoefficient: number;
}

/** The airframe's numbers as the demo revision saw them (SI). */
export interface AirframeSnapshot {
  id: string | null;
  name: string;
  emptyMassKg: number;
  maxMassKg: number;
  wingAreaM2: number;
  wingSpanM: number;
  oswaldEfficiency: number;
  zeroLiftDragCoefficient: number;
  configurations: {
    clean: ConfigurationValues;
    gearDown: ConfigurationValues | null;
    flaps1: ConfigurationValues | null;
    flaps2: ConfigurationValues | null;
  };
}

/** An aircraft profile's numbers as a demo revision snapshots them (any extra fields of the profile are left out). */
export function snapshotOf(a: AirframeSnapshot): AirframeSnapshot {
  return {
    id: a.id,
    name: a.name,
    emptyMassKg: a.emptyMassKg,
    maxMassKg: a.maxMassKg,
    wingAreaM2: a.wingAreaM2,
    wingSpanM: a.wingSpanM,
    oswaldEfficiency: a.oswaldEfficiency,
    zeroLiftDragCoefficient: a.zeroLiftDragCoefficient,
    configurations: a.configurations,
  };
}

export interface DemoCase {
  label: string;
  massKg: number;
  altitudeM: number;
  isaDeviationK: number;
  configuration: ConfigurationKey;
}

export const CURVE_KEYS = ["zeroLift", "liftDependent", "idealInduced", "increment", "total", "power", "liftToDrag"] as const;
export type CurveKey = (typeof CURVE_KEYS)[number];
export const CURVE_LABELS: Record<CurveKey, string> = {
  zeroLift: "Zero-lift drag",
  liftDependent: "Lift-dependent drag",
  idealInduced: "Ideal induced drag",
  increment: "Lift-dependent increment",
  total: "Total drag",
  power: "Power required",
  liftToDrag: "L/D",
};

export const MARKER_KEYS = ["vmd", "vmp", "stall", "bestGlide", "chosen"] as const;
export type MarkerKey = (typeof MARKER_KEYS)[number];
export const MARKER_LABELS: Record<MarkerKey, string> = {
  vmd: "Vmd",
  vmp: "Vmp",
  stall: "Stall speed",
  bestGlide: "Best glide",
  chosen: "Chosen speed",
};

export const CALL_KINDS = ["vmd", "stall", "gust"] as const;
export type CallKind = (typeof CALL_KINDS)[number];

/** What one demo revision shows (validated on the server by schema.ts). */
export interface DemoSpec {
  version: 1;
  airframe: AirframeSnapshot;
  cases: DemoCase[];
  curves: Record<CurveKey, boolean>;
  markers: Record<MarkerKey, boolean>;
  axis: { speed: "equivalent" | "true"; unit: "kt" | "ms" };
  range: { minSpeedMs: number; maxSpeedMs: number };
  chosenSpeedMs: number;
  /** Call it first: which answer the student places before the reveal (null: no call). */
  callKind: CallKind | null;
  notes: string;
}

export const SAMPLE_POINTS = 400;

/** The library's Aircraft for a case: clean numbers plus the configuration's increment and CLmax. */
export function aircraftFor(airframe: AirframeSnapshot, c: Pick<DemoCase, "massKg" | "configuration">): Aircraft {
  const conf = airframe.configurations[c.configuration] ?? airframe.configurations.clean;
  return {
    massKg: c.massKg,
    wingAreaM2: airframe.wingAreaM2,
    wingSpanM: airframe.wingSpanM,
    oswaldEfficiency: airframe.oswaldEfficiency,
    zeroLiftDragCoefficient: airframe.zeroLiftDragCoefficient + (c.configuration === "clean" ? 0 : conf.cd0Increment),
    maxLiftCoefficient: conf.maxLiftCoefficient,
  };
}

export function curveCaseFor(airframe: AirframeSnapshot, c: DemoCase): CurveCase {
  return { aircraft: aircraftFor(airframe, c), altitudeM: c.altitudeM, isaDeviationK: c.isaDeviationK };
}

/** A speed on the chosen axis (EAS or TAS, m/s) shown in the chosen unit. */
export function speedInUnit(ms: number, unit: "kt" | "ms"): number {
  return unit === "kt" ? msToKt(ms) : ms;
}
export function speedFromUnit(value: number, unit: "kt" | "ms"): number {
  return unit === "kt" ? ktToMs(value) : value;
}
export function speedUnitLabel(unit: "kt" | "ms"): string {
  return unit === "kt" ? "kt" : "m/s";
}
export function formatSpeed(ms: number, unit: "kt" | "ms"): string {
  return `${speedInUnit(ms, unit).toFixed(unit === "kt" ? 0 : 1)} ${speedUnitLabel(unit)}`;
}

/** Vmd of a case on the spec's speed axis, m/s (EAS or TAS). */
export function vmdOnAxis(spec: Pick<DemoSpec, "airframe" | "axis">, c: DemoCase): number {
  const v = minimumDragSpeed(aircraftFor(spec.airframe, c), { altitudeM: c.altitudeM, isaDeviationK: c.isaDeviationK });
  return spec.axis.speed === "true" ? v.trueAirspeedMs : v.equivalentAirspeedMs;
}

export function stallOnAxis(spec: Pick<DemoSpec, "airframe" | "axis">, c: DemoCase): number {
  const v = stallSpeed(aircraftFor(spec.airframe, c), { altitudeM: c.altitudeM, isaDeviationK: c.isaDeviationK });
  return spec.axis.speed === "true" ? v.trueAirspeedMs : v.equivalentAirspeedMs;
}

/**
 * Where the speed settles, thrust held, after a gust adds a little speed to an aeroplane trimmed
 * at `trimmedMs` (on the spec's axis). Above Vmd (speed-stable) it returns to the trimmed speed.
 * Below Vmd (speed-unstable) it keeps accelerating until the drag again equals the thrust, at
 * the other speed of the same drag: with D = aV^2 + b/V^2 the two roots of D = T satisfy
 * V1 V2 = sqrt(b/a) = Vmd^2, so V1 = Vmd^2 / V0 (the same ratio holds for EAS and TAS).
 * lib/aero's speedChangeResponse says which way the disturbance goes.
 */
export function speedAfterGust(spec: Pick<DemoSpec, "airframe" | "axis">, c: DemoCase, trimmedMs: number): number {
  const aircraft = aircraftFor(spec.airframe, c);
  const conditions = { altitudeM: c.altitudeM, isaDeviationK: c.isaDeviationK };
  const trimmedTas = spec.axis.speed === "true" ? trimmedMs : equivalentToTrue(trimmedMs, c.altitudeM, c.isaDeviationK);
  const response = speedChangeResponse(aircraft, { ...conditions, trueAirspeedMs: trimmedTas }, Math.max(0.05, trimmedTas * 0.01));
  if (response.dragCurveTendency !== "diverges") return trimmedMs;
  const vmd = vmdOnAxis(spec, c);
  return (vmd * vmd) / trimmedMs;
}

/** The answer of a Call it first on the spec's first case, on its speed axis, m/s. */
export function callAnswer(spec: DemoSpec, kind: CallKind): number {
  const c = spec.cases[0];
  if (!c) throw new Error("spec has no case");
  if (kind === "vmd") return vmdOnAxis(spec, c);
  if (kind === "stall") return stallOnAxis(spec, c);
  return speedAfterGust(spec, c, spec.chosenSpeedMs);
}

export const CALL_PROMPTS: Record<CallKind, string> = {
  vmd: "Where is Vmd, the speed of least drag, for the first case?",
  stall: "Where is the stall speed for the first case?",
  gust: "Trimmed at the chosen speed with thrust left alone, a gust adds a few knots. Where does the speed settle?",
};

/** A default spec for an airframe: one case at maximum mass, clean, sea level ISA. */
export function defaultSpec(airframe: AirframeSnapshot): DemoSpec {
  const mass = airframe.maxMassKg;
  const c: DemoCase = { label: "Max mass", massKg: mass, altitudeM: 0, isaDeviationK: 0, configuration: "clean" };
  const vmd = minimumDragSpeed(aircraftFor(airframe, c), { altitudeM: 0 }).equivalentAirspeedMs;
  const vs = stallSpeed(aircraftFor(airframe, c), { altitudeM: 0 }).equivalentAirspeedMs;
  return {
    version: 1,
    airframe,
    cases: [c],
    curves: { zeroLift: true, liftDependent: true, idealInduced: false, increment: false, total: true, power: false, liftToDrag: false },
    markers: { vmd: true, vmp: true, stall: true, bestGlide: false, chosen: false },
    axis: { speed: "equivalent", unit: "kt" },
    // round knots, so the axis reads 40 … 150 kt rather than 36.9 … 192.4
    range: {
      minSpeedMs: ktToMs(Math.max(10, Math.floor((msToKt(vs) * 0.75) / 10) * 10)),
      maxSpeedMs: ktToMs(Math.ceil((msToKt(vmd) * 2.2) / 10) * 10),
    },
    chosenSpeedMs: ktToMs(Math.round(msToKt(vmd) * 0.85)),
    callKind: null,
    notes: "",
  };
}
