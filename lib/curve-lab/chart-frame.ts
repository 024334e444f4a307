import { sampleCurves, massToWeightN, equivalentToTrue, validity, validityText, type CurveSet } from "@/lib/aero";
import { CURVE_KEYS, SAMPLE_POINTS, aircraftFor, curveCaseFor, speedInUnit, type CurveKey, type DemoSpec } from "./demo-spec";

/**
 * Turns a demo spec into chart data without allocating on the hot path: one preallocated array
 * of {x, y} points per dataset (four cases x seven curves), overwritten in place on every slider
 * movement. Framework-free, so the builder, the Projector view and the bench share it.
 */

export const MAX_CASES = 4;
export interface Point {
  x: number;
  y: number;
}

/** Dataset index of case `c`, curve `k`. */
export function datasetIndex(caseIndex: number, curve: CurveKey): number {
  return caseIndex * CURVE_KEYS.length + CURVE_KEYS.indexOf(curve);
}

export interface CaseOverlay {
  vmdMs: number;
  vmpMs: number;
  stallMs: number;
  minDragN: number;
  maxLiftToDrag: number;
  /** Total drag at the chosen speed, N (null when the chosen speed is off the axis). */
  chosenDragN: number | null;
  /**
   * lib/aero's validity words of each marked speed ("" when valid), shown beside the number on the
   * chart as the readouts show them. The stall speed itself is valid (CL = CLmax) unless above Mach 0.3.
   */
  flags: { vmd: string; vmp: string; stall: string };
}

export interface Frame {
  /** points[datasetIndex] */
  points: Point[][];
  /** which datasets are drawn */
  visible: boolean[];
  cases: CaseOverlay[];
  yMaxDragN: number;
  yMaxPowerKw: number;
  yMaxLiftToDrag: number;
  xMin: number;
  xMax: number;
}

export function newFrame(): Frame {
  const n = MAX_CASES * CURVE_KEYS.length;
  const points: Point[][] = [];
  for (let d = 0; d < n; d++) {
    const arr: Point[] = new Array<Point>(SAMPLE_POINTS);
    for (let i = 0; i < SAMPLE_POINTS; i++) arr[i] = { x: 0, y: 0 };
    points.push(arr);
  }
  return {
    points,
    visible: new Array<boolean>(n).fill(false),
    cases: [],
    yMaxDragN: 1,
    yMaxPowerKw: 1,
    yMaxLiftToDrag: 1,
    xMin: 0,
    xMax: 1,
  };
}

/** Fills `frame` from `spec`; reuses `cache` (the library's own typed arrays) between calls. */
export function fillFrame(frame: Frame, spec: DemoSpec, cache: { set?: CurveSet<Float64Array> }): Frame {
  const cases = spec.cases.map((c) => curveCaseFor(spec.airframe, c));
  const set = sampleCurves(
    cases,
    { minSpeedMs: spec.range.minSpeedMs, maxSpeedMs: spec.range.maxSpeedMs, points: SAMPLE_POINTS, speedAxis: spec.axis.speed },
    { reuse: cache.set },
  );
  cache.set = set;
  const unit = spec.axis.unit;
  const factor = speedInUnit(1, unit);
  const speeds = set.speedsMs;
  let dragMax = 0;
  let powerMax = 0;
  let ldMax = 0;
  frame.cases.length = 0;
  frame.visible.fill(false);
  for (let c = 0; c < set.cases.length; c++) {
    const cc = set.cases[c]!;
    const weight = massToWeightN(spec.cases[c]!.massKg);
    const minDragN = weight / cc.markers.maxLiftToDrag;
    // the chosen speed's drag, read off the sampled curve
    let chosenDragN: number | null = null;
    const v = spec.chosenSpeedMs;
    if (v >= spec.range.minSpeedMs && v <= spec.range.maxSpeedMs) {
      const pos = ((v - spec.range.minSpeedMs) / (spec.range.maxSpeedMs - spec.range.minSpeedMs)) * (SAMPLE_POINTS - 1);
      const i = Math.min(SAMPLE_POINTS - 2, Math.floor(pos));
      const f = pos - i;
      chosenDragN = cc.totalDragN[i]! * (1 - f) + cc.totalDragN[i + 1]! * f;
    }
    const sc = spec.cases[c]!;
    const flagAt = (axisMs: number, onlyMach = false) => {
      const tasMs = spec.axis.speed === "true" ? axisMs : equivalentToTrue(axisMs, sc.altitudeM, sc.isaDeviationK);
      const v = validity(aircraftFor(spec.airframe, sc), {
        altitudeM: sc.altitudeM,
        isaDeviationK: sc.isaDeviationK,
        trueAirspeedMs: tasMs,
      });
      return validityText(onlyMach ? v.flags.filter((f) => f === "compressible") : v.flags);
    };
    frame.cases.push({
      vmdMs: cc.markers.minimumDragSpeedMs,
      vmpMs: cc.markers.minimumPowerSpeedMs,
      stallMs: cc.markers.stallSpeedMs,
      minDragN,
      maxLiftToDrag: cc.markers.maxLiftToDrag,
      chosenDragN,
      flags: {
        vmd: flagAt(cc.markers.minimumDragSpeedMs),
        vmp: flagAt(cc.markers.minimumPowerSpeedMs),
        stall: flagAt(cc.markers.stallSpeedMs, true),
      },
    });
    // The drag axis is scaled for the airframe's maximum mass, so it stays put while a mass
    // slider moves and the curve is seen to move against it.
    const heaviest = massToWeightN(spec.airframe.maxMassKg) / cc.markers.maxLiftToDrag;
    dragMax = Math.max(dragMax, Math.ceil((heaviest * 3) / 100) * 100);
    for (const k of CURVE_KEYS) {
      if (!spec.curves[k]) continue;
      const di = datasetIndex(c, k);
      frame.visible[di] = true;
      const src =
        k === "zeroLift"
          ? cc.zeroLiftDragN
          : k === "liftDependent"
            ? cc.liftDependentDragN
            : k === "idealInduced"
              ? cc.idealInducedDragN
              : k === "increment"
                ? cc.liftDependentIncrementN
                : k === "total"
                  ? cc.totalDragN
                  : k === "power"
                    ? cc.powerRequiredW
                    : cc.liftToDrag;
      const scale = k === "power" ? 0.001 : 1;
      const out = frame.points[di]!;
      for (let i = 0; i < SAMPLE_POINTS; i++) {
        const p = out[i]!;
        p.x = speeds[i]! * factor;
        p.y = src[i]! * scale;
      }
      if (k === "power") {
        // minimum power required is near Vmp; show up to four times it
        let pmin = Infinity;
        for (let i = 0; i < SAMPLE_POINTS; i++) if (src[i]! < pmin) pmin = src[i]!;
        const massFactor = Math.pow(spec.airframe.maxMassKg / spec.cases[c]!.massKg, 1.5); // Pmin grows as W^1.5
        powerMax = Math.max(powerMax, Math.ceil((pmin * massFactor * 4) / 1000 / 5) * 5);
      }
      if (k === "liftToDrag") ldMax = Math.max(ldMax, cc.markers.maxLiftToDrag * 1.15);
    }
  }
  frame.yMaxDragN = dragMax || 1;
  frame.yMaxPowerKw = powerMax || 1;
  frame.yMaxLiftToDrag = ldMax || 1;
  frame.xMin = spec.range.minSpeedMs * factor;
  frame.xMax = spec.range.maxSpeedMs * factor;
  return frame;
}
