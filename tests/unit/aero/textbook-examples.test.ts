import {
  dragAt,
  ftToM,
  glideDistance,
  jetBestRangeSpeed,
  lbToKg,
  maxLiftToDrag,
  minimumDragSpeed,
  minimumPowerSpeed,
  mToFt,
  nToLbf,
  stallSpeed,
  wToHp,
  bestGlide,
  STANDARD_GRAVITY_MS2,
} from "@/lib/aero";
import { CJ1, CP1, GIVEN_POLAR, JET_OF_OUR_OWN, LIGHT_OF_OUR_OWN, fromWeight } from "./fixtures";
import { expectRelative, expectWithin } from "./helpers";

// Worked examples (lib/aero/REFERENCES.md §5–§7): the book's own examples ("Memory": recalled from the book,
// weaker) and "Derived" values recomputed from the formulas, with the working written out in REFERENCES.md.
// Tolerances: half a unit in the last printed digit unless stated.

const SL = { altitudeM: 0 };

describe("Anderson, Introduction to Flight, 8th ed., ch. 6: the CP-1 light aeroplane", () => {
  it("(L/D)max = 13.6 (Example 6.7)", () => {
    // Memory: Anderson Ex. 6.7, (L/D)max = 13.6 for the CP-1 (REFERENCES.md §5.1).
    expectWithin(minimumDragSpeed(CP1, SL).maxLiftToDrag, 13.6, 0.05);
  });

  it("minimum glide angle 4.2 deg (Example 6.7/6.9)", () => {
    // Memory: Anderson Ex. 6.7, minimum glide angle 4.2 deg (REFERENCES.md §5.1).
    expectWithin((bestGlide(CP1, SL).glideAngleRad * 180) / Math.PI, 4.2, 0.05);
  });

  it("glides about 136,000 ft from 10,000 ft (Example 6.7)", () => {
    // Memory: Anderson Ex. 6.7, from 10,000 ft (3048 m) about 136,000 ft (REFERENCES.md §5.1). Tolerance 0.5 %.
    expectRelative(mToFt(glideDistance(CP1, { heightM: 3048 }).distanceM), 136000, 0.005);
  });

  it("at 200 ft/s at sea level: CL 0.357, CD 0.0319, L/D 11.2, thrust required ~263 lb, power ~95.9 hp (Example 6.1 table)", () => {
    // Memory: Anderson Ex. 6.1 tabulated values (REFERENCES.md §5.1, §6A). Anderson works in English units with
    // rho = 0.002377 slug/ft3, so the thrust is compared to +-1 lb and the power to +-0.2 hp.
    const d = dragAt(CP1, { altitudeM: 0, trueAirspeedMs: ftToM(200) });
    expectWithin(d.liftCoefficient, 0.357, 0.0005);
    expectWithin(d.dragCoefficient, 0.0319, 0.00005);
    expectWithin(d.liftToDrag, 11.2, 0.05);
    expectWithin(nToLbf(d.totalDragN), 263, 1);
    expectWithin(wToHp(d.powerRequiredW), 95.9, 0.2);
  });

  it("Vmd, Dmin, Vmp and Pmin at sea level and 10,000 ft, at W and 0.8 W (Derived regression table)", () => {
    // Derived: REFERENCES.md §5.2 regression table (CP-1 SI inputs), tolerance rel 1e-4.
    const rows = [
      { h: 0, w: 1, vmdTas: 44.147, vmdEas: 44.147, dmin: 964.8, vmpTas: 33.544, pmin: 37371 },
      { h: ftToM(10000), w: 1, vmdTas: 51.372, vmdEas: 44.147, dmin: 964.8, vmpTas: 39.034, pmin: 43487 },
      { h: 0, w: 0.8, vmdTas: 39.486, vmdEas: 39.486, dmin: 771.9, vmpTas: 30.003, pmin: 26740 },
      { h: ftToM(10000), w: 0.8, vmdTas: 45.949, vmdEas: 39.486, dmin: 771.9, vmpTas: 34.913, pmin: 31117 },
    ];
    for (const r of rows) {
      const plane = { ...CP1, massKg: CP1.massKg * r.w };
      const vmd = minimumDragSpeed(plane, { altitudeM: r.h });
      const vmp = minimumPowerSpeed(plane, { altitudeM: r.h });
      expectRelative(vmd.trueAirspeedMs, r.vmdTas, 1e-4);
      expectRelative(vmd.equivalentAirspeedMs, r.vmdEas, 1e-4);
      expectRelative(vmd.totalDragN, r.dmin, 1e-4);
      expectRelative(vmp.trueAirspeedMs, r.vmpTas, 1e-4);
      expectRelative(vmp.powerRequiredW, r.pmin, 1e-4);
    }
  });
});

describe("Anderson, Introduction to Flight, 8th ed., ch. 6: the CJ-1 business jet", () => {
  it("(L/D)max = 16.9 (Example 6.8)", () => {
    // Memory: Anderson Ex. 6.8, (L/D)max = 16.9 for the CJ-1 (REFERENCES.md §6B; Derived 16.862).
    expectWithin(minimumDragSpeed(CJ1, SL).maxLiftToDrag, 16.9, 0.05);
  });

  it("glides about 169,000 ft from 10,000 ft at about 3.4 deg (Example 6.8)", () => {
    // Memory: Anderson Ex. 6.8, ~169,000 ft from 10,000 ft and ~3.4 deg (REFERENCES.md §6B). Tolerance 0.3 % and 0.05 deg.
    expectRelative(mToFt(glideDistance(CJ1, { heightM: 3048 }).distanceM), 169000, 0.003);
    expectWithin((bestGlide(CJ1, SL).glideAngleRad * 180) / Math.PI, 3.4, 0.05);
  });

  it("Vmd 85.00 m/s, Dmin 5229 N and jet best-range speed 111.87 m/s with L/D 14.60 at sea level (Derived)", () => {
    // Derived: REFERENCES.md §6B (working there), rel 1e-4; the 3^(1/4) Vmd factor is Derived in §9.5.
    const vmd = minimumDragSpeed(CJ1, SL);
    expectRelative(vmd.trueAirspeedMs, 85.0, 1e-4);
    expectRelative(vmd.totalDragN, 5229, 1e-4);
    const range = jetBestRangeSpeed(CJ1, SL);
    expectRelative(range.trueAirspeedMs, 111.87, 1e-4);
    expectWithin(range.liftToDrag, 14.6, 0.005);
  });
});

describe("a polar given directly: CD = 0.025 + 0.0415 CL^2, W = 3,500 lb, S = 150 ft² (Derived, REFERENCES.md §6C)", () => {
  it("(L/D)max = 15.52", () => {
    // Derived: 1/(2 sqrt(0.025 x 0.0415)) = 15.523 (REFERENCES.md §6C)
    expectWithin(maxLiftToDrag(GIVEN_POLAR), 15.52, 0.005);
  });

  it("(CL^3/CD^2)max = 242.95, Pmin = 57.21 hp at V = 120.85 ft/s", () => {
    // Derived: working in REFERENCES.md §6C (CL = 1.34433, CD = 0.1, V = 36.835 m/s, P = 42 659 W)
    const mp = minimumPowerSpeed(GIVEN_POLAR, SL);
    const cd = mp.liftCoefficient / mp.liftToDrag;
    expectWithin(mp.liftCoefficient ** 3 / cd ** 2, 242.95, 0.01);
    expectWithin(wToHp(mp.powerRequiredW), 57.21, 0.01);
    expectWithin(mToFt(mp.trueAirspeedMs), 120.85, 0.01);
  });

  it("the weight used is 3,500 lb", () => {
    // REFERENCES.md §6C input; 1 lb = 0.45359237 kg exactly (§4.4)
    expectWithin(GIVEN_POLAR.massKg, lbToKg(3500), 1e-9);
  });
});

describe("a jet of our own: best-range speed at 9,000 m (Derived, REFERENCES.md §6D and §9.5)", () => {
  it("is 3^(1/4) Vmd = 175.76 m/s", () => {
    // Derived: Vmd = 133.55 m/s at 9,000 m, x 3^(1/4) = 175.76 m/s (working in REFERENCES.md §6D); tolerance 0.05 %.
    const v = jetBestRangeSpeed(JET_OF_OUR_OWN, { altitudeM: 9000 }).trueAirspeedMs;
    expectRelative(v, 175.76, 0.0005);
    expectRelative(v / minimumDragSpeed(JET_OF_OUR_OWN, { altitudeM: 9000 }).trueAirspeedMs, Math.pow(3, 0.25), 1e-12);
  });
});

describe("a light aeroplane of our own (Derived, REFERENCES.md §6H)", () => {
  it("k 0.058946, (L/D)max 14.562, Vmd 41.855 m/s, Dmin 858.39 N, Vmp 31.803 m/s, Pmin 31,522 W, 3^(1/4) Vmd 55.084 m/s", () => {
    // Derived: working in REFERENCES.md §6H, rel 1e-4.
    const vmd = minimumDragSpeed(LIGHT_OF_OUR_OWN, SL);
    const vmp = minimumPowerSpeed(LIGHT_OF_OUR_OWN, SL);
    expectRelative(vmd.maxLiftToDrag, 14.562, 1e-4);
    expectRelative(vmd.trueAirspeedMs, 41.855, 1e-4);
    expectRelative(vmd.totalDragN, 858.39, 1e-4);
    expectRelative(vmp.trueAirspeedMs, 31.803, 1e-4);
    expectRelative(vmp.powerRequiredW, 31522, 1e-4);
    expectRelative(jetBestRangeSpeed(LIGHT_OF_OUR_OWN, SL).trueAirspeedMs, 55.084, 1e-4);
  });
});

describe("stall speed example (Derived, REFERENCES.md §7)", () => {
  it("W = 8000 N, S = 17 m2, CLmax = 2.2 at sea level stalls at 18.69 m/s", () => {
    // Derived: sqrt(2 x 8000/(1.225 x 17 x 2.2)) = 18.688 m/s (REFERENCES.md §7, lift equation §5.4).
    const plane = fromWeight(8000, {
      wingAreaM2: 17,
      wingSpanM: Math.sqrt(8 * 17),
      zeroLiftDragCoefficient: 0.03,
      oswaldEfficiency: 0.8,
      maxLiftCoefficient: 2.2,
    });
    expectWithin(stallSpeed(plane, SL).equivalentAirspeedMs, 18.69, 0.005);
    expect(plane.massKg * STANDARD_GRAVITY_MS2).toBeCloseTo(8000, 9);
  });
});
