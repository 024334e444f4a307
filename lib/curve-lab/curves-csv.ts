import { sampleCurves, validity, validityText } from "@/lib/aero";
import { aircraftFor, curveCaseFor, speedInUnit, speedUnitLabel, type DemoSpec } from "./demo-spec";

/** Speeds sampled for the CSV export. */
export const CSV_POINTS = 400;

/**
 * The demo's curves as a table for the CSV export: one row per sampled speed, seven figures per
 * case and, beside them, lib/aero's validity words at that speed ("" when valid), so a row below
 * the stall or above Mach 0.3 is never a bare figure.
 */
export function curvesTable(spec: DemoSpec): { header: string[]; rows: string[][] } {
  const unit = spec.axis.unit;
  const set = sampleCurves(
    spec.cases.map((c) => curveCaseFor(spec.airframe, c)),
    { minSpeedMs: spec.range.minSpeedMs, maxSpeedMs: spec.range.maxSpeedMs, points: CSV_POINTS, speedAxis: spec.axis.speed },
    { arrays: "plain" },
  );
  const axis = spec.axis.speed === "true" ? "TAS" : "EAS";
  const header = [`${axis} (${speedUnitLabel(unit)})`];
  for (const c of spec.cases)
    header.push(
      `${c.label}: zero-lift drag (N)`,
      `${c.label}: lift-dependent drag (N)`,
      `${c.label}: ideal induced drag (N)`,
      `${c.label}: lift-dependent increment (N)`,
      `${c.label}: total drag (N)`,
      `${c.label}: power required (kW)`,
      `${c.label}: L/D`,
      `${c.label}: model validity`,
    );
  const aircraft = spec.cases.map((c) => aircraftFor(spec.airframe, c));
  const rows = set.speedsMs.map((v, i) => {
    const row: string[] = [speedInUnit(v, unit).toFixed(2)];
    set.cases.forEach((c, ci) => {
      const sc = spec.cases[ci]!;
      const conditions = { altitudeM: sc.altitudeM, isaDeviationK: sc.isaDeviationK, trueAirspeedMs: c.trueAirspeedMs[i]! };
      row.push(
        c.zeroLiftDragN[i]!.toFixed(1),
        c.liftDependentDragN[i]!.toFixed(1),
        c.idealInducedDragN[i]!.toFixed(1),
        c.liftDependentIncrementN[i]!.toFixed(1),
        c.totalDragN[i]!.toFixed(1),
        (c.powerRequiredW[i]! / 1000).toFixed(3),
        c.liftToDrag[i]!.toFixed(3),
        validityText(validity(aircraft[ci]!, conditions).flags),
      );
    });
    return row;
  });
  return { header, rows };
}
