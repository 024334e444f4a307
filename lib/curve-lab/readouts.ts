import { bestGlide, equivalentToTrue, minimumDragSpeed, minimumPowerSpeed, stallSpeed, validity, validityText } from "@/lib/aero";
import {
  CONFIGURATION_KEYS,
  CONFIGURATION_LABELS,
  aircraftFor,
  callAnswer,
  formatSpeed,
  type CallKind,
  type AirframeSnapshot,
  type ConfigurationKey,
  type DemoCase,
  type DemoSpec,
} from "./demo-spec";

/** Derived figures of one case (or a profile at a mass and altitude), all from lib/aero, on the chosen axis. */
export interface CaseFigures {
  vmdMs: number;
  vmpMs: number;
  stallMs: number;
  maxLiftToDrag: number;
  bestGlideMs: number;
  glideRatio: number;
  vmdTasMs: number;
  /**
   * Where a speed leaves the model's validity (below the stall, above Mach 0.3), as the short
   * words shown beside it; "" when valid. From lib/aero's `validity`.
   */
  flags: { vmd: string; vmp: string; bestGlide: string; stall: string };
}

/**
 * The validity words of a stall speed. The stall speed is where CL = CLmax, which lib/aero's
 * `validity` counts as valid; rounding can put the computed CL a hair above CLmax, so only a
 * speed measurably below the stall keeps the below-stall flags (never the case here), and Mach
 * above 0.3 is flagged as for any speed.
 */
function stallFlag(aircraft: ReturnType<typeof aircraftFor>, cond: { altitudeM: number; isaDeviationK: number }, tasMs: number) {
  const v = validity(aircraft, { ...cond, trueAirspeedMs: tasMs });
  const atStall = v.speedOverStall > 1 - 1e-9;
  return validityText(v.flags.filter((f) => f === "compressible" || !atStall));
}

/** A speed with its validity words beside it, e.g. "52 kt (below stall: model not valid)". */
export function flaggedSpeed(ms: number, unit: Parameters<typeof formatSpeed>[1], flag: string): string {
  return flag ? `${formatSpeed(ms, unit)} (${flag})` : formatSpeed(ms, unit);
}

/**
 * (L/D)max with Vmd's validity words: the ratio is flown at Vmd, so where Vmd leaves the model's
 * validity the ratio does too, e.g. "4.1 (at Vmd: below stall: model not valid)".
 */
export function flaggedLiftToDrag(f: Pick<CaseFigures, "maxLiftToDrag" | "flags">): string {
  const ratio = f.maxLiftToDrag.toLocaleString("en-GB", { minimumFractionDigits: 1, maximumFractionDigits: 1 });
  return f.flags.vmd ? `${ratio} (at Vmd: ${f.flags.vmd})` : ratio;
}

export function caseFigures(airframe: AirframeSnapshot, c: DemoCase, axis: "equivalent" | "true"): CaseFigures {
  const aircraft = aircraftFor(airframe, c);
  const cond = { altitudeM: c.altitudeM, isaDeviationK: c.isaDeviationK };
  const pick = (v: { equivalentAirspeedMs: number; trueAirspeedMs: number }) =>
    axis === "true" ? v.trueAirspeedMs : v.equivalentAirspeedMs;
  const vmd = minimumDragSpeed(aircraft, cond);
  const vmp = minimumPowerSpeed(aircraft, cond);
  const glide = bestGlide(aircraft, cond);
  const stall = stallSpeed(aircraft, cond);
  const flagAt = (tasMs: number) => validityText(validity(aircraft, { ...cond, trueAirspeedMs: tasMs }).flags);
  return {
    vmdMs: pick(vmd),
    vmpMs: pick(vmp),
    stallMs: pick(stall),
    maxLiftToDrag: vmd.maxLiftToDrag,
    bestGlideMs: pick(glide),
    glideRatio: glide.glideRatio,
    vmdTasMs: vmd.trueAirspeedMs,
    flags: {
      vmd: flagAt(vmd.trueAirspeedMs),
      vmp: flagAt(vmp.trueAirspeedMs),
      bestGlide: flagAt(glide.trueAirspeedMs),
      stall: stallFlag(aircraft, cond, stall.trueAirspeedMs),
    },
  };
}

/**
 * The validity words of a Call it first answer on the spec's first case ("" when valid): Vmd's and
 * the stall speed's as the readouts show them, and for the speed a gust settles at, that speed's.
 */
export function callAnswerFlag(spec: DemoSpec, kind: CallKind): string {
  const c = spec.cases[0];
  if (!c) return "";
  const f = caseFigures(spec.airframe, c, spec.axis.speed);
  if (kind === "vmd") return f.flags.vmd;
  if (kind === "stall") return f.flags.stall;
  const ms = callAnswer(spec, kind);
  const tasMs = spec.axis.speed === "true" ? ms : equivalentToTrue(ms, c.altitudeM, c.isaDeviationK);
  return validityText(
    validity(aircraftFor(spec.airframe, c), { altitudeM: c.altitudeM, isaDeviationK: c.isaDeviationK, trueAirspeedMs: tasMs }).flags,
  );
}

/** Stall speed in every configuration the airframe has, at a case's mass and altitude, with its validity words ("" when valid). */
export function stallByConfiguration(airframe: AirframeSnapshot, c: DemoCase, axis: "equivalent" | "true") {
  return CONFIGURATION_KEYS.filter((k) => k === "clean" || airframe.configurations[k] !== null).map((k: ConfigurationKey) => {
    const aircraft = aircraftFor(airframe, { ...c, configuration: k });
    const cond = { altitudeM: c.altitudeM, isaDeviationK: c.isaDeviationK };
    const s = stallSpeed(aircraft, cond);
    return {
      configuration: k,
      label: CONFIGURATION_LABELS[k],
      ms: axis === "true" ? s.trueAirspeedMs : s.equivalentAirspeedMs,
      flag: stallFlag(aircraft, cond, s.trueAirspeedMs),
    };
  });
}

/** Plain-language "what if" lines for the focused case. */
export function whatIf(spec: DemoSpec, caseIndex: number): string[] {
  const c = spec.cases[caseIndex];
  if (!c) return [];
  const unit = spec.axis.unit;
  const now = caseFigures(spec.airframe, c, spec.axis.speed);
  const heavier = caseFigures(spec.airframe, { ...c, massKg: c.massKg * 1.1 }, spec.axis.speed);
  // each Vmd with its validity words, as the readouts show it
  const vmdOf = (f: CaseFigures, ms = f.vmdMs) => flaggedSpeed(ms, unit, f.flags.vmd);
  const lines = [`10% more mass moves Vmd from ${vmdOf(now)} to ${vmdOf(heavier)}.`];
  const draggier = CONFIGURATION_KEYS.find((k) => k !== c.configuration && k !== "clean" && spec.airframe.configurations[k] !== null);
  if (draggier) {
    const other = caseFigures(spec.airframe, { ...c, configuration: draggier }, spec.axis.speed);
    lines.push(
      `${CONFIGURATION_LABELS[draggier]} instead of ${CONFIGURATION_LABELS[c.configuration].toLowerCase()} moves Vmd from ${vmdOf(now)} to ${vmdOf(other)}.`,
    );
  }
  if (spec.axis.speed === "equivalent" && c.altitudeM > 0) {
    lines.push(`At this altitude Vmd of ${vmdOf(now)} EAS is ${vmdOf(now, now.vmdTasMs)} TAS.`);
  }
  return lines;
}

export const GUST_BELOW_VMD =
  "With the thrust left alone, a gust that slows you raises the drag, so you slow further; one that speeds you up lowers the drag, so you keep speeding up. The speed wanders off until you move the throttle.";
export const GUST_ABOVE_VMD =
  "With the thrust left alone, a gust that speeds you up raises the drag, which slows you back; one that slows you lowers the drag, so you speed back up. The speed returns to where it was.";
export const AXIS_ASSUMPTION = "Speeds assume IAS = CAS = EAS (no instrument or position error, no compressibility).";
