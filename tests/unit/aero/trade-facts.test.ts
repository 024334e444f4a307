import {
  bestGlide,
  dragAt,
  equivalentToTrue,
  ftToM,
  jetBestRangeSpeed,
  ktToMs,
  minimumDragSpeed,
  minimumPowerSpeed,
  msToKt,
} from "@/lib/aero";
import { CJ1, CP1, LIGHT_OF_OUR_OWN } from "./fixtures";
import { expectRelative, expectWithin } from "./helpers";

// Facts of the trade ("common practice"), each with the tolerance the fact itself carries. A rule of thumb is
// compared with the rule, within the rule's own looseness, not with an exact value from the model.

const PLANES = [
  ["CP-1", CP1],
  ["CJ-1", CJ1],
  ["light aeroplane of our own", LIGHT_OF_OUR_OWN],
] as const;

describe("common practice: zero-lift drag grows with V^2, induced drag falls with 1/V^2", () => {
  it.each(PLANES)(
    "%s: doubling 100 -> 200 kt gives zero-lift drag x4, its power x8, induced drag x1/4, induced power x1/2",
    (_n, plane) => {
      // Common practice (REFERENCES.md §9.2; follows from the polar, §5.2).
      // The relations are exact in a parabolic polar: tolerance 1e-12 relative.
      const slow = dragAt(plane, { altitudeM: 0, trueAirspeedMs: ktToMs(100) });
      const fast = dragAt(plane, { altitudeM: 0, trueAirspeedMs: ktToMs(200) });
      expectRelative(fast.zeroLiftDragN / slow.zeroLiftDragN, 4, 1e-12);
      expectRelative((fast.zeroLiftDragN * ktToMs(200)) / (slow.zeroLiftDragN * ktToMs(100)), 8, 1e-12);
      expectRelative(fast.liftDependentDragN / slow.liftDependentDragN, 0.25, 1e-12);
      expectRelative((fast.liftDependentDragN * ktToMs(200)) / (slow.liftDependentDragN * ktToMs(100)), 0.5, 1e-12);
    },
  );
});

describe("common practice: at Vmd", () => {
  it.each(PLANES)("%s: zero-lift and lift-dependent drag are equal and L/D is at its maximum", (_n, plane) => {
    // Common practice, "induced drag = parasite drag at L/D max" (REFERENCES.md §9.3, Derived in §5.2).
    // Equality exact in the model: tolerance 1e-9 relative.
    const vmd = minimumDragSpeed(plane, { altitudeM: 1000 });
    const at = dragAt(plane, { altitudeM: 1000, trueAirspeedMs: vmd.trueAirspeedMs });
    expectRelative(at.zeroLiftDragN, at.liftDependentDragN, 1e-9);
    expectRelative(at.liftToDrag, vmd.maxLiftToDrag, 1e-12);
    expectRelative(at.totalDragN, vmd.totalDragN, 1e-12);
    for (const f of [0.9, 0.99, 1.01, 1.1]) {
      const other = dragAt(plane, { altitudeM: 1000, trueAirspeedMs: f * vmd.trueAirspeedMs });
      expect(other.liftToDrag).toBeLessThan(at.liftToDrag);
    }
  });

  it.each(PLANES)("%s: drag rises on both sides of Vmd, D(2 Vmd) = D(Vmd/2) = 2.125 Dmin", (_n, plane) => {
    // Common practice (the drag curve's "bucket"); the 2.125 factor is Derived (REFERENCES.md §9.3), tolerance 1e-12.
    const vmd = minimumDragSpeed(plane, { altitudeM: 0 });
    let previous = Number.POSITIVE_INFINITY;
    for (let f = 0.5; f < 1; f += 0.05) {
      const d = dragAt(plane, { altitudeM: 0, trueAirspeedMs: f * vmd.trueAirspeedMs }).totalDragN;
      expect(d).toBeLessThan(previous);
      expect(d).toBeGreaterThan(vmd.totalDragN);
      previous = d;
    }
    previous = vmd.totalDragN;
    for (let f = 1.05; f <= 2; f += 0.05) {
      const d = dragAt(plane, { altitudeM: 0, trueAirspeedMs: f * vmd.trueAirspeedMs }).totalDragN;
      expect(d).toBeGreaterThan(previous);
      previous = d;
    }
    const twice = dragAt(plane, { altitudeM: 0, trueAirspeedMs: 2 * vmd.trueAirspeedMs }).totalDragN;
    const half = dragAt(plane, { altitudeM: 0, trueAirspeedMs: 0.5 * vmd.trueAirspeedMs }).totalDragN;
    expectRelative(twice / vmd.totalDragN, 2.125, 1e-12);
    expectRelative(half / vmd.totalDragN, 2.125, 1e-12);
  });
});

describe("common practice: the characteristic speeds relative to Vmd", () => {
  it.each(PLANES)("%s: Vmp is about 0.76 Vmd (+-0.005)", (_n, plane) => {
    // Common practice (3^(-1/4) = 0.7598, REFERENCES.md §9.4); at Vmp the lift-dependent drag is three times the
    // zero-lift drag (Derived, REFERENCES.md §5.3; Anderson, Introduction to Flight, 8th ed., ch. 6, Memory).
    const vmd = minimumDragSpeed(plane, { altitudeM: 2000 });
    const vmp = minimumPowerSpeed(plane, { altitudeM: 2000 });
    expectWithin(vmp.trueAirspeedMs / vmd.trueAirspeedMs, 0.76, 0.005);
    const at = dragAt(plane, { altitudeM: 2000, trueAirspeedMs: vmp.trueAirspeedMs });
    expectRelative(at.liftDependentDragN / at.zeroLiftDragN, 3, 1e-9);
  });

  it.each(PLANES)("%s: the jet best-range speed is about 1.32 Vmd (+-0.005)", (_n, plane) => {
    // Derived for a jet (constant thrust-specific fuel consumption: minimum D/V ⇒ CD0 = 3 k CL² ⇒ V = 3^(1/4) Vmd
    // = 1.31607 Vmd), working in REFERENCES.md §9.5.
    const vmd = minimumDragSpeed(plane, { altitudeM: 8000 });
    const range = jetBestRangeSpeed(plane, { altitudeM: 8000 });
    expectWithin(range.trueAirspeedMs / vmd.trueAirspeedMs, 1.32, 0.005);
  });

  it.each(PLANES)("%s: best glide is flown at Vmd (+-0.5 %) with glide ratio (L/D)max", (_n, plane) => {
    // Common practice: best glide at (L/D)max, i.e. at Vmd (REFERENCES.md §9.6, Derived in §5.5).
    // The model's steady glide (L = W cos gamma) is a fraction of a percent slower than Vmd.
    const vmd = minimumDragSpeed(plane, { altitudeM: 500 });
    const glide = bestGlide(plane, { altitudeM: 500 });
    expectRelative(glide.trueAirspeedMs, vmd.trueAirspeedMs, 0.005);
    expect(glide.trueAirspeedMs).toBeLessThan(vmd.trueAirspeedMs);
    expectRelative(glide.glideRatio, vmd.maxLiftToDrag, 1e-12);
  });
});

describe("common practice: TAS exceeds IAS by roughly 2 % per 1,000 ft", () => {
  it("agrees with the rule within 4 % of the rule's TAS up to 10,000 ft, and TAS always exceeds IAS above sea level", () => {
    // Common practice: TAS = IAS + 2 % per 1000 ft (5000 ft +10 %, 10 000 ft +20 %), REFERENCES.md §4.3.
    // The rule runs 2-3 % high against ISA at 5,000-10,000 ft (REFERENCES.md §4.3), hence 4 %. IAS = EAS here.
    for (let ft = 1000; ft <= 10000; ft += 1000) {
      for (const kias of [60, 100, 140]) {
        const ruleKtas = kias * (1 + 0.02 * (ft / 1000));
        const modelKtas = msToKt(equivalentToTrue(ktToMs(kias), ftToM(ft)));
        expect(modelKtas).toBeGreaterThan(kias);
        expectRelative(modelKtas, ruleKtas, 0.04);
      }
    }
  });

  it("at 10,000 ft ISA, 100 KEAS is 116.37 KTAS; at 5,000 ft 107.73 KTAS (Derived)", () => {
    // Derived (REFERENCES.md §4.2): EAS = TAS sqrt(sigma), rel 1e-4.
    expectRelative(msToKt(equivalentToTrue(ktToMs(100), ftToM(10000))), 116.37, 1e-4);
    expectRelative(msToKt(equivalentToTrue(ktToMs(100), ftToM(5000))), 107.73, 1e-4);
  });
});
