import fc from "fast-check";
import { dragAt, minimumDragSpeed, minimumPowerSpeed, speedChangeResponse, speedStability } from "@/lib/aero";
import { CP1, CJ1, realisticAircraft } from "./fixtures";
import { expectRelative } from "./helpers";

// Regions of command (REFERENCES.md §8.1): on the drag (thrust-required) curve the reversed region is below
// Vmd (FAA Instrument Flying Handbook, FAA-H-8083-15, "Regions of Command"); on the power-required curve it is
// below Vmp (FAA Airplane Flying Handbook, FAA-H-8083-3).

const H = { altitudeM: 1200 };

describe("speed stability on the drag curve at constant thrust (boundary Vmd)", () => {
  const vmd = minimumDragSpeed(CP1, H).trueAirspeedMs;

  it("is unstable below Vmd, neutral within 1 %, stable above", () => {
    const at = (f: number) => speedStability(CP1, { ...H, trueAirspeedMs: f * vmd });
    expect(at(0.8).regime).toBe("unstable");
    expect(at(0.985).regime).toBe("unstable");
    expect(at(0.995).regime).toBe("neutral");
    expect(at(1).regime).toBe("neutral");
    expect(at(1.009).regime).toBe("neutral");
    expect(at(1.015).regime).toBe("stable");
    expect(at(1.6).regime).toBe("stable");
    expect(at(1.6).regimeCurve).toBe("drag-at-constant-thrust");
  });

  it("has dD/dV < 0 below Vmd, 0 at Vmd and > 0 above", () => {
    expect(speedStability(CP1, { ...H, trueAirspeedMs: 0.9 * vmd }).dragSlopeNPerMs).toBeLessThan(0);
    expect(speedStability(CP1, { ...H, trueAirspeedMs: 1.1 * vmd }).dragSlopeNPerMs).toBeGreaterThan(0);
    const atVmd = speedStability(CP1, { ...H, trueAirspeedMs: vmd });
    expect(Math.abs(atVmd.dragSlopeNPerMs)).toBeLessThan(1e-9 * minimumDragSpeed(CP1, H).totalDragN);
  });

  it("one thrust setting balances drag at two speeds, one each side of Vmd", () => {
    // FAA Instrument Flying Handbook, Regions of Command (REFERENCES.md §8.1): the same thrust gives two equilibrium speeds.
    const thrust = dragAt(CP1, { ...H, trueAirspeedMs: 0.7 * vmd }).totalDragN;
    // D(x Vmd) = Dmin/2 (x^2 + 1/x^2) is symmetric in x <-> 1/x, so the partner speed is Vmd / 0.7.
    expectRelative(dragAt(CP1, { ...H, trueAirspeedMs: vmd / 0.7 }).totalDragN, thrust, 1e-12);
  });

  it("the analytic slope equals a central difference of dragAt (property)", () => {
    fc.assert(
      fc.property(realisticAircraft, fc.double({ min: 0.4, max: 3, noNaN: true }), (plane, f) => {
        const v = f * minimumDragSpeed(plane, H).trueAirspeedMs;
        const dv = v * 1e-5;
        const numeric =
          (dragAt(plane, { ...H, trueAirspeedMs: v + dv }).totalDragN - dragAt(plane, { ...H, trueAirspeedMs: v - dv }).totalDragN) /
          (2 * dv);
        const s = speedStability(plane, { ...H, trueAirspeedMs: v });
        const scale = dragAt(plane, { ...H, trueAirspeedMs: v }).totalDragN / v;
        expect(Math.abs(s.dragSlopeNPerMs - numeric)).toBeLessThanOrEqual(1e-6 * scale);
        const numericPower =
          (dragAt(plane, { ...H, trueAirspeedMs: v + dv }).powerRequiredW -
            dragAt(plane, { ...H, trueAirspeedMs: v - dv }).powerRequiredW) /
          (2 * dv);
        expect(Math.abs(s.powerSlopeWPerMs - numericPower)).toBeLessThanOrEqual(1e-6 * scale * v);
      }),
      { numRuns: 200 },
    );
  });
});

describe("speed stability on the power curve at constant power (boundary Vmp)", () => {
  const vmd = minimumDragSpeed(CJ1, H).trueAirspeedMs;
  const vmp = minimumPowerSpeed(CJ1, H).trueAirspeedMs;

  it("is reversed below Vmp, so between Vmp and Vmd the two curves disagree", () => {
    const between = speedStability(CJ1, { ...H, trueAirspeedMs: (vmp + vmd) / 2 });
    expect(between.regime).toBe("unstable");
    expect(between.powerCurveRegime).toBe("stable");
    expect(between.powerCurveRegimeCurve).toBe("power-at-constant-power");
    expect(between.powerSlopeWPerMs).toBeGreaterThan(0);
    const below = speedStability(CJ1, { ...H, trueAirspeedMs: 0.9 * vmp });
    expect(below.powerCurveRegime).toBe("unstable");
    expect(below.powerSlopeWPerMs).toBeLessThan(0);
    expect(speedStability(CJ1, { ...H, trueAirspeedMs: 1.005 * vmp }).powerCurveRegime).toBe("neutral");
    expectRelative(between.minimumPowerTrueAirspeedMs, vmp, 1e-12);
    expectRelative(between.minimumDragTrueAirspeedMs, vmd, 1e-12);
  });
});

describe("what a gust does (speed change response)", () => {
  const vmd = minimumDragSpeed(CP1, H).trueAirspeedMs;

  it("above Vmd a speed gain raises drag past the thrust, so the speed returns", () => {
    const r = speedChangeResponse(CP1, { ...H, trueAirspeedMs: 1.3 * vmd }, 3);
    expect(r.dragChangeN).toBeGreaterThan(0);
    expect(r.excessThrustN).toBeLessThan(0);
    expect(r.dragCurveTendency).toBe("returns");
  });

  it("below Vmd a speed loss raises drag, so the speed keeps decaying; a gain lowers drag and keeps growing", () => {
    const loss = speedChangeResponse(CP1, { ...H, trueAirspeedMs: 0.8 * vmd }, -2);
    expect(loss.dragChangeN).toBeGreaterThan(0);
    expect(loss.dragCurveTendency).toBe("diverges");
    const gain = speedChangeResponse(CP1, { ...H, trueAirspeedMs: 0.8 * vmd }, 2);
    expect(gain.excessThrustN).toBeGreaterThan(0);
    expect(gain.dragCurveTendency).toBe("diverges");
  });

  it("the drag change is the difference of dragAt at the two speeds, and the linear estimate is close for small changes", () => {
    const v = 1.2 * vmd;
    const r = speedChangeResponse(CP1, { ...H, trueAirspeedMs: v }, 0.2);
    const before = dragAt(CP1, { ...H, trueAirspeedMs: v }).totalDragN;
    const after = dragAt(CP1, { ...H, trueAirspeedMs: v + 0.2 }).totalDragN;
    expectRelative(r.dragChangeN, after - before, 1e-9);
    expectRelative(r.linearDragChangeN, r.dragChangeN, 0.02);
    expect(r.toTrueAirspeedMs).toBe(v + 0.2);
  });

  it("speedStability carries the same response when given speedChangeMs", () => {
    const withGust = speedStability(CP1, { ...H, trueAirspeedMs: 0.9 * vmd, speedChangeMs: -1 });
    const direct = speedChangeResponse(CP1, { ...H, trueAirspeedMs: 0.9 * vmd }, -1);
    expect(withGust.speedChange).toEqual(direct);
    expect(speedStability(CP1, { ...H, trueAirspeedMs: 0.9 * vmd }).speedChange).toBeUndefined();
  });

  it("a zero change has no tendency", () => {
    const r = speedChangeResponse(CP1, { ...H, trueAirspeedMs: vmd }, 0);
    expect(r.dragCurveTendency).toBe("none");
    expect(r.powerCurveTendency).toBe("none");
  });

  it("the tendency matches the regime for small changes away from the boundaries (property)", () => {
    fc.assert(
      fc.property(realisticAircraft, fc.double({ min: 0.5, max: 2.5, noNaN: true }), fc.boolean(), (plane, f, up) => {
        fc.pre(Math.abs(f - 1) > 0.02);
        const v = f * minimumDragSpeed(plane, H).trueAirspeedMs;
        const s = speedStability(plane, { ...H, trueAirspeedMs: v, speedChangeMs: (up ? 1 : -1) * v * 1e-3 });
        expect(s.speedChange?.dragCurveTendency).toBe(s.regime === "stable" ? "returns" : "diverges");
      }),
      { numRuns: 200 },
    );
  });
});
