import fc from "fast-check";
import { sampleCurves, type CurveCase } from "@/lib/aero";
import { baselineCurves, createBaselineOutput, type BaselineCase } from "@/lib/aero/bench/baseline";
import { compareWithBaseline, formatCurvesBench, runCurvesBench } from "@/lib/aero/bench/curvesBench";
import { anyAircraft, anyAltitude, anyIsaDeviation, anyLoadFactor } from "./fixtures";

// The benchmark's plain-loop baseline must compute exactly what the library computes, or the speed ratio
// would compare different work. (No timing is asserted here.)

function toBaseline(c: Required<Pick<CurveCase, "altitudeM" | "isaDeviationK" | "loadFactor">> & CurveCase): BaselineCase {
  return {
    ...c.aircraft,
    altitudeM: c.altitudeM,
    isaDeviationK: c.isaDeviationK,
    loadFactor: c.loadFactor,
  };
}

describe("bench baseline", () => {
  it("computes the same curves and markers as sampleCurves (property, EAS axis)", () => {
    const aCase = fc.record({ aircraft: anyAircraft, altitudeM: anyAltitude, isaDeviationK: anyIsaDeviation, loadFactor: anyLoadFactor });
    fc.assert(
      fc.property(fc.array(aCase, { minLength: 1, maxLength: 5 }), fc.double({ min: 0.01, max: 100, noNaN: true }), (cases, lo) => {
        const points = 37;
        const hi = lo * 5;
        const lib = sampleCurves(cases, { minSpeedMs: lo, maxSpeedMs: hi, points, speedAxis: "equivalent" });
        const out = createBaselineOutput(cases.length, points);
        baselineCurves(cases.map(toBaseline), lo, hi, points, out);
        expect(compareWithBaseline(lib, out)).toBeLessThanOrEqual(1e-12);
      }),
      { numRuns: 200 },
    );
  });

  it("a tiny bench run reports finite figures, the agreement check and a PASS/FAIL line", () => {
    const r = runCurvesBench({ cases: 2, points: 20, repetitions: 3, callsPerRepetition: 2, warmupCalls: 4, inputSets: 3, seed: 7 });
    expect(r.maxRelativeDifference).toBeLessThanOrEqual(1e-12);
    for (const x of [r.libraryNsPerPoint, r.baselineNsPerPoint, r.ratio, r.sink]) expect(Number.isFinite(x)).toBe(true);
    const lines = formatCurvesBench(r);
    expect(lines.some((l) => l.includes("ratio library/baseline"))).toBe(true);
    expect(lines[lines.length - 1]).toMatch(/\[aero curves\] (PASS|FAIL)$/);
  });
});
