import { bestGlide, minimumDragSpeed, minimumPowerSpeed, stallSpeed, validity, validityText } from "@/lib/aero";
import {
  CONFIGURATION_KEYS,
  CONFIGURATION_LABELS,
  aircraftFor,
  formatSpeed,
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
  flags: { vmd: string; vmp: string; bestGlide: string };
}

/** A speed with its validity words beside it, e.g. "52 kt (below stall: model not valid)". */
export function flaggedSpeed(ms: number, unit: Parameters<typeof formatSpeed>[1], flag: string): string {
  return flag ? `${formatSpeed(ms, unit)} (${flag})` : formatSpeed(ms, unit);
}

export function caseFigures(airframe: AirframeSnapshot, c: DemoCase, axis: "equivalent" | "true"): CaseFigures {
  const aircraft = aircraftFor(airframe, c);
  const cond = { altitudeM: c.altitudeM, isaDeviationK: c.isaDeviationK };
  const pick = (v: { equivalentAirspeedMs: number; trueAirspeedMs: number }) =>
    axis === "true" ? v.trueAirspeedMs : v.equivalentAirspeedMs;
  const vmd = minimumDragSpeed(aircraft, cond);
  const vmp = minimumPowerSpeed(aircraft, cond);
  const glide = bestGlide(aircraft, cond);
  const flagAt = (tasMs: number) => validityText(validity(aircraft, { ...cond, trueAirspeedMs: tasMs }).flags);
  return {
    vmdMs: pick(vmd),
    vmpMs: pick(vmp),
    stallMs: pick(stallSpeed(aircraft, cond)),
    maxLiftToDrag: vmd.maxLiftToDrag,
    bestGlideMs: pick(glide),
    glideRatio: glide.glideRatio,
    vmdTasMs: vmd.trueAirspeedMs,
    flags: { vmd: flagAt(vmd.trueAirspeedMs), vmp: flagAt(vmp.trueAirspeedMs), bestGlide: flagAt(glide.trueAirspeedMs) },
  };
}

/** Stall speed in every configuration the airframe has, at a case's mass and altitude. */
export function stallByConfiguration(airframe: AirframeSnapshot, c: DemoCase, axis: "equivalent" | "true") {
  return CONFIGURATION_KEYS.filter((k) => k === "clean" || airframe.configurations[k] !== null).map((k: ConfigurationKey) => {
    const s = stallSpeed(aircraftFor(airframe, { ...c, configuration: k }), { altitudeM: c.altitudeM, isaDeviationK: c.isaDeviationK });
    return { configuration: k, label: CONFIGURATION_LABELS[k], ms: axis === "true" ? s.trueAirspeedMs : s.equivalentAirspeedMs };
  });
}

/** Plain-language "what if" lines for the focused case. */
export function whatIf(spec: DemoSpec, caseIndex: number): string[] {
  const c = spec.cases[caseIndex];
  if (!c) return [];
  const unit = spec.axis.unit;
  const now = caseFigures(spec.airframe, c, spec.axis.speed);
  const heavier = caseFigures(spec.airframe, { ...c, massKg: c.massKg * 1.1 }, spec.axis.speed);
  const lines = [`10% more mass moves Vmd from ${formatSpeed(now.vmdMs, unit)} to ${formatSpeed(heavier.vmdMs, unit)}.`];
  const draggier = CONFIGURATION_KEYS.find((k) => k !== c.configuration && k !== "clean" && spec.airframe.configurations[k] !== null);
  if (draggier) {
    const other = caseFigures(spec.airframe, { ...c, configuration: draggier }, spec.axis.speed);
    lines.push(
      `${CONFIGURATION_LABELS[draggier]} instead of ${CONFIGURATION_LABELS[c.configuration].toLowerCase()} moves Vmd from ${formatSpeed(now.vmdMs, unit)} to ${formatSpeed(other.vmdMs, unit)}.`,
    );
  }
  if (spec.axis.speed === "equivalent" && c.altitudeM > 0) {
    lines.push(`At this altitude Vmd of ${formatSpeed(now.vmdMs, unit)} EAS is ${formatSpeed(now.vmdTasMs, unit)} TAS.`);
  }
  return lines;
}

export const GUST_BELOW_VMD =
  "With the thrust left alone, a gust that slows you raises the drag, so you slow further; one that speeds you up lowers the drag, so you keep speeding up. The speed wanders off until you move the throttle.";
export const GUST_ABOVE_VMD =
  "With the thrust left alone, a gust that speeds you up raises the drag, which slows you back; one that slows you lowers the drag, so you speed back up. The speed returns to where it was.";
export const AXIS_ASSUMPTION = "Speeds assume IAS = CAS = EAS (no instrument or position error, no compressibility).";
