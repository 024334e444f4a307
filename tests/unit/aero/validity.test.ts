import fc from "fast-check";
import {
  AeroInputError,
  FAR_BELOW_STALL_FRACTION,
  INCOMPRESSIBLE_MACH_LIMIT,
  dragAt,
  minimumDragSpeed,
  stallSpeed,
  standardAtmosphere,
  validity,
  validityText,
  type Aircraft,
} from "@/lib/aero";
import { caseFigures, flaggedSpeed } from "@/lib/curve-lab/readouts";
import type { AirframeSnapshot } from "@/lib/curve-lab/demo-spec";
import { CP1 } from "./fixtures";

// Validity flags (REFERENCES.md §5.4 for the stall boundary, §9.1 for the Mach 0.3 limit). Each boundary is
// checked one part in 1e9 either side: exactly on the boundary the result still counts as valid.

const WITH_CLMAX: Aircraft = { ...CP1, maxLiftCoefficient: 1.5 };
const JUST = 1e-9;

describe("below the stall: CL above CLmax (lift equation, REFERENCES.md §5.4)", () => {
  it.each([
    [0, 1],
    [3000, 1],
    [0, 2],
  ])("at altitude %p m and load factor %p the flag starts just below Vs", (altitudeM, loadFactor) => {
    const vs = stallSpeed(WITH_CLMAX, { altitudeM, loadFactor }).trueAirspeedMs;
    const above = validity(WITH_CLMAX, { altitudeM, loadFactor, trueAirspeedMs: vs * (1 + JUST) });
    const below = validity(WITH_CLMAX, { altitudeM, loadFactor, trueAirspeedMs: vs * (1 - JUST) });
    expect(above.flags).toEqual([]);
    expect(below.flags).toEqual(["below_stall"]);
    expect(below.liftCoefficient).toBeGreaterThan(WITH_CLMAX.maxLiftCoefficient);
    // the CL it reports is the one dragAt computes (lift equation CL = nW/(qS))
    expect(below.liftCoefficient).toBeCloseTo(
      dragAt(WITH_CLMAX, { altitudeM, loadFactor, trueAirspeedMs: vs * (1 - JUST) }).liftCoefficient,
      12,
    );
    expect(above.speedOverStall).toBeCloseTo(1, 8);
  });
});

describe("far below the stall: under a tenth of Vs", () => {
  it("flags below 0.1 Vs and not at 0.1 Vs", () => {
    const vs = stallSpeed(WITH_CLMAX, { altitudeM: 0 }).trueAirspeedMs;
    const at = validity(WITH_CLMAX, { altitudeM: 0, trueAirspeedMs: vs * FAR_BELOW_STALL_FRACTION * (1 + JUST) });
    const under = validity(WITH_CLMAX, { altitudeM: 0, trueAirspeedMs: vs * FAR_BELOW_STALL_FRACTION * (1 - JUST) });
    expect(at.flags).toEqual(["below_stall"]);
    expect(under.flags).toEqual(["below_stall", "far_below_stall"]);
    // Derived (REFERENCES.md §5.4): CL ∝ 1/V², so a tenth of Vs needs 100 CLmax
    expect(under.liftCoefficient / WITH_CLMAX.maxLiftCoefficient).toBeCloseTo(100, 4);
    expect(validityText(under.flags)).toBe("far below stall: meaningless");
  });
});

describe("compressibility: Mach above 0.3 (common practice, REFERENCES.md §9.1)", () => {
  it.each([0, 5000, 11000])("at %p m the flag starts just above Mach 0.3", (altitudeM) => {
    const a = standardAtmosphere(altitudeM).speedOfSoundMs;
    const at = validity(WITH_CLMAX, { altitudeM, trueAirspeedMs: INCOMPRESSIBLE_MACH_LIMIT * a * (1 - JUST) });
    const over = validity(WITH_CLMAX, { altitudeM, trueAirspeedMs: INCOMPRESSIBLE_MACH_LIMIT * a * (1 + JUST) });
    expect(at.flags).toEqual([]);
    expect(over.flags).toEqual(["compressible"]);
    expect(over.machNumber).toBeCloseTo(0.3, 8);
  });

  it("uses the speed of sound of the day: ISA +30 K moves the Mach 0.3 speed up", () => {
    // Derived (REFERENCES.md §1): a = sqrt(γ R T); at sea level, ISA+30: sqrt(1.4 × 287.05287 × 318.15) = 357.57 m/s
    const tas = 0.3 * 350; // 105 m/s: Mach 0.3087 in ISA (a = 340.294 m/s), Mach 0.2937 at ISA +30 K
    expect(validity(WITH_CLMAX, { altitudeM: 0, trueAirspeedMs: tas }).flags).toEqual(["compressible"]);
    expect(validity(WITH_CLMAX, { altitudeM: 0, isaDeviationK: 30, trueAirspeedMs: tas }).flags).toEqual([]);
  });

  it("refuses bad input like dragAt, naming the field", () => {
    expect(() => validity(WITH_CLMAX, { altitudeM: 0, trueAirspeedMs: -1 })).toThrow(AeroInputError);
    expect(() => validity({ ...WITH_CLMAX, maxLiftCoefficient: 0 }, { altitudeM: 0, trueAirspeedMs: 50 })).toThrow(/maxLiftCoefficient/);
  });
});

describe("flags agree with the stall speed over the whole realistic domain (fast-check)", () => {
  it("below_stall exactly when TAS < Vs(TAS); compressible exactly when M > 0.3", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1, max: 3, noNaN: true }),
        fc.double({ min: 0, max: 10000, noNaN: true }),
        fc.double({ min: 0.02, max: 3, noNaN: true }),
        (clmax, altitudeM, ratio) => {
          const plane = { ...CP1, maxLiftCoefficient: clmax };
          const vs = stallSpeed(plane, { altitudeM }).trueAirspeedMs;
          const v = vs * ratio;
          const r = validity(plane, { altitudeM, trueAirspeedMs: v });
          if (Math.abs(ratio - 1) > 1e-9) expect(r.flags.includes("below_stall")).toBe(ratio < 1);
          if (Math.abs(ratio - 0.1) > 1e-9) expect(r.flags.includes("far_below_stall")).toBe(ratio < 0.1);
          const mach = v / standardAtmosphere(altitudeM).speedOfSoundMs;
          if (Math.abs(mach - 0.3) > 1e-9) expect(r.flags.includes("compressible")).toBe(mach > 0.3);
        },
      ),
      { numRuns: 300 },
    );
  });
});

describe("Curve Lab readouts show the flag beside the number", () => {
  // An invented airframe whose clean Vmd lies below its stall: very high CD0 with a low CLmax.
  const airframe: AirframeSnapshot = {
    id: null,
    name: "Test brick",
    emptyMassKg: 600,
    maxMassKg: 1000,
    wingAreaM2: 15,
    wingSpanM: 6,
    oswaldEfficiency: 0.7,
    zeroLiftDragCoefficient: 0.3,
    configurations: {
      clean: { cd0Increment: 0, maxLiftCoefficient: 0.6 },
      gearDown: null,
      flaps1: null,
      flaps2: null,
    },
  };
  const c = { label: "A", massKg: 900, altitudeM: 0, isaDeviationK: 0, configuration: "clean" as const };

  it("Vmd below the stall reads 'below stall: model not valid'", () => {
    const f = caseFigures(airframe, c, "equivalent");
    expect(f.vmdMs).toBeLessThan(f.stallMs);
    expect(f.flags.vmd).toBe("below stall: model not valid");
    expect(flaggedSpeed(f.vmdMs, "kt", f.flags.vmd)).toMatch(/^\d+ kt \(below stall: model not valid\)$/);
  });

  it("a trainer's readouts carry no flag", () => {
    const trainer = {
      ...airframe,
      zeroLiftDragCoefficient: 0.027,
      wingSpanM: 10,
      configurations: { ...airframe.configurations, clean: { cd0Increment: 0, maxLiftCoefficient: 1.5 } },
    };
    const f = caseFigures(trainer, c, "equivalent");
    expect(f.flags).toEqual({ vmd: "", vmp: "", bestGlide: "", stall: "" });
    expect(flaggedSpeed(f.vmdMs, "kt", f.flags.vmd)).toMatch(/^\d+ kt$/);
  });

  it("a fast case at altitude flags compressibility on Vmd", () => {
    // heavy, small wing: Vmd TAS at 11 km is above Mach 0.3 (a = 295.07 m/s there, REFERENCES.md §2)
    const jet = {
      ...airframe,
      maxMassKg: 60000,
      emptyMassKg: 30000,
      wingAreaM2: 40,
      wingSpanM: 20,
      zeroLiftDragCoefficient: 0.02,
      configurations: { ...airframe.configurations, clean: { cd0Increment: 0, maxLiftCoefficient: 1.5 } },
    };
    const jc = { ...c, massKg: 60000, altitudeM: 11000 };
    const vmdTas = minimumDragSpeed(
      { massKg: 60000, wingAreaM2: 40, wingSpanM: 20, zeroLiftDragCoefficient: 0.02, oswaldEfficiency: 0.7, maxLiftCoefficient: 1.5 },
      { altitudeM: 11000 },
    ).trueAirspeedMs;
    expect(vmdTas / 295.07).toBeGreaterThan(0.3);
    expect(caseFigures(jet, jc, "true").flags.vmd).toContain("above Mach 0.3");
  });
});
