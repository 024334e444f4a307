import { dragAt, minimumDragSpeed, minimumPowerSpeed, sampleCurves, stallSpeed, standardAtmosphere, type CurveCase } from "@/lib/aero";
import { CJ1, CP1 } from "./fixtures";
import { expectInputError, expectRelative } from "./helpers";

const CASES: CurveCase[] = [
  { aircraft: CP1, altitudeM: 0 },
  { aircraft: { ...CP1, massKg: CP1.massKg * 0.8 }, altitudeM: 0 },
  { aircraft: { ...CP1, zeroLiftDragCoefficient: 0.04, maxLiftCoefficient: 2.1 }, altitudeM: 2438.4, isaDeviationK: 10 },
  { aircraft: CP1, altitudeM: 1500, loadFactor: 1.5 },
];

describe("sampleCurves", () => {
  it("matches dragAt at every sampled speed, for every case, on the TAS axis", () => {
    const set = sampleCurves(CASES, { minSpeedMs: 20, maxSpeedMs: 90, points: 57, speedAxis: "true" });
    expect(set.cases).toHaveLength(CASES.length);
    CASES.forEach((c, ci) => {
      const out = set.cases[ci]!;
      for (let i = 0; i < set.points; i++) {
        const v = set.speedsMs[i]!;
        const d = dragAt(c.aircraft, { ...c, trueAirspeedMs: v });
        expect(out.trueAirspeedMs[i]).toBe(v);
        expectRelative(out.zeroLiftDragN[i]!, d.zeroLiftDragN, 1e-12);
        expectRelative(out.liftDependentDragN[i]!, d.liftDependentDragN, 1e-12);
        expectRelative(out.idealInducedDragN[i]!, d.idealInducedDragN, 1e-12);
        expectRelative(out.liftDependentIncrementN[i]!, d.liftDependentIncrementN, 1e-12);
        expectRelative(out.totalDragN[i]!, d.totalDragN, 1e-12);
        expectRelative(out.powerRequiredW[i]!, d.powerRequiredW, 1e-12);
        expectRelative(out.liftToDrag[i]!, d.liftToDrag, 1e-12);
      }
    });
  });

  it("spans the range inclusively with even spacing", () => {
    const set = sampleCurves(CASES, { minSpeedMs: 15, maxSpeedMs: 95, points: 81 });
    expect(set.speedsMs[0]).toBe(15);
    expect(set.speedsMs[80]).toBe(95);
    for (let i = 1; i < 81; i++) expectRelative(set.speedsMs[i]! - set.speedsMs[i - 1]!, 1, 1e-9);
  });

  it("on the EAS axis gives the same drag curve at every altitude, with power scaled by 1/sqrt(sigma)", () => {
    const cases: CurveCase[] = [
      { aircraft: CJ1, altitudeM: 0 },
      { aircraft: CJ1, altitudeM: 6000 },
      { aircraft: CJ1, altitudeM: 15000, isaDeviationK: -10 },
    ];
    const set = sampleCurves(cases, { minSpeedMs: 50, maxSpeedMs: 200, points: 31, speedAxis: "equivalent" });
    const [sl, mid, high] = set.cases;
    const sigmaHigh = standardAtmosphere(15000, -10).densityRatio;
    for (let i = 0; i < 31; i++) {
      expectRelative(mid!.totalDragN[i]!, sl!.totalDragN[i]!, 1e-12);
      expectRelative(high!.totalDragN[i]!, sl!.totalDragN[i]!, 1e-12);
      expectRelative(high!.powerRequiredW[i]! / sl!.powerRequiredW[i]!, 1 / Math.sqrt(sigmaHigh), 1e-12);
      expectRelative(high!.trueAirspeedMs[i]!, set.speedsMs[i]! / Math.sqrt(sigmaHigh), 1e-12);
    }
    expectRelative(high!.markers.minimumDragSpeedMs, sl!.markers.minimumDragSpeedMs, 1e-12);
  });

  it("reports Vmd, Vmp, stall speed and (L/D)max markers on the axis's scale", () => {
    for (const speedAxis of ["equivalent", "true"] as const) {
      const set = sampleCurves(CASES, { minSpeedMs: 20, maxSpeedMs: 90, points: 3, speedAxis });
      CASES.forEach((c, ci) => {
        const m = set.cases[ci]!.markers;
        const key = speedAxis === "true" ? "trueAirspeedMs" : "equivalentAirspeedMs";
        expectRelative(m.minimumDragSpeedMs, minimumDragSpeed(c.aircraft, c)[key], 1e-12);
        expectRelative(m.minimumPowerSpeedMs, minimumPowerSpeed(c.aircraft, c)[key], 1e-12);
        expectRelative(m.stallSpeedMs, stallSpeed(c.aircraft, c)[key], 1e-12);
        expectRelative(m.maxLiftToDrag, minimumDragSpeed(c.aircraft, c).maxLiftToDrag, 1e-12);
      });
    }
  });

  it("splits lift-dependent drag into ideal induced drag plus the increment, which is zero for e = 1", () => {
    const elliptic = { ...CP1, oswaldEfficiency: 1 };
    const set = sampleCurves([{ aircraft: elliptic, altitudeM: 0 }, ...CASES], { minSpeedMs: 25, maxSpeedMs: 80, points: 12 });
    const e1 = set.cases[0]!;
    for (let i = 0; i < 12; i++) {
      expect(e1.liftDependentIncrementN[i]).toBe(0);
      expectRelative(e1.idealInducedDragN[i]!, e1.liftDependentDragN[i]!, 1e-15);
      for (const c of set.cases.slice(1)) {
        expectRelative(c.idealInducedDragN[i]! + c.liftDependentIncrementN[i]!, c.liftDependentDragN[i]!, 1e-15);
        // e = 0.8: the increment is (1/e - 1) = 25 % of the ideal induced drag.
        expectRelative(c.liftDependentIncrementN[i]! / c.idealInducedDragN[i]!, 0.25, 1e-12);
      }
    }
  });

  it("writes into a reused result without allocating new arrays", () => {
    const range = { minSpeedMs: 20, maxSpeedMs: 90, points: 400 };
    const first = sampleCurves(CASES, range);
    const arrays = first.cases.map((c) => c.totalDragN);
    const before = Array.from(first.cases[0]!.totalDragN);
    const heavier = CASES.map((c) => ({ ...c, aircraft: { ...c.aircraft, massKg: c.aircraft.massKg * 1.1 } }));
    const second = sampleCurves(heavier, range, { reuse: first });
    expect(second).toBe(first);
    second.cases.forEach((c, i) => expect(c.totalDragN).toBe(arrays[i]));
    expect(Array.from(second.cases[0]!.totalDragN)).not.toEqual(before);
    const fresh = sampleCurves(heavier, range);
    expect(Array.from(second.cases[2]!.powerRequiredW)).toEqual(Array.from(fresh.cases[2]!.powerRequiredW));
  });

  it("allocates a new result when the reused one has another shape", () => {
    const first = sampleCurves(CASES, { minSpeedMs: 20, maxSpeedMs: 90, points: 10 });
    const other = sampleCurves(CASES.slice(0, 2), { minSpeedMs: 20, maxSpeedMs: 90, points: 10 }, { reuse: first });
    expect(other).not.toBe(first);
    expect(other.cases).toHaveLength(2);
  });

  it("returns plain arrays on request, equal to the typed ones", () => {
    const range = { minSpeedMs: 20, maxSpeedMs: 90, points: 25 };
    const typed = sampleCurves(CASES, range);
    const plain = sampleCurves(CASES, range, { arrays: "plain" });
    expect(Array.isArray(plain.speedsMs)).toBe(true);
    expect(Array.isArray(plain.cases[1]!.liftToDrag)).toBe(true);
    expect(plain.cases[1]!.liftToDrag).toEqual(Array.from(typed.cases[1]!.liftToDrag));
    expect(JSON.parse(JSON.stringify(plain))).toEqual(plain);
  });

  it("handles no cases and many cases", () => {
    expect(sampleCurves([], { minSpeedMs: 20, maxSpeedMs: 90, points: 5 }).cases).toHaveLength(0);
    const many = Array.from({ length: 24 }, (_, i) => ({ aircraft: CP1, altitudeM: i * 500 }));
    const set = sampleCurves(many, { minSpeedMs: 20, maxSpeedMs: 90, points: 50 });
    expect(set.cases).toHaveLength(24);
  });

  it("names the case and field of an invalid case", () => {
    const bad = [CASES[0]!, { ...CASES[1]!, aircraft: { ...CP1, massKg: 0 } }];
    const error = expectInputError(() => sampleCurves(bad, { minSpeedMs: 20, maxSpeedMs: 90, points: 5 }), "massKg");
    expect(error.path).toEqual(["cases", 1, "massKg"]);
    const badAltitude = expectInputError(
      () => sampleCurves([{ aircraft: CP1, altitudeM: 25000 }], { minSpeedMs: 20, maxSpeedMs: 90, points: 5 }),
      "altitudeM",
    );
    expect(badAltitude.path).toEqual(["cases", 0, "altitudeM"]);
  });
});
