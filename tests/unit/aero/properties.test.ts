import fc from "fast-check";
import {
  AeroInputError,
  LIMITS,
  aircraftSchema,
  bestGlide,
  densityAltitude,
  dragAt,
  equivalentToTrue,
  glideDistance,
  jetBestRangeSpeed,
  minimumDragSpeed,
  minimumPowerSpeed,
  pressureAltitudeFromPressure,
  sampleCurves,
  speedStability,
  stallSpeed,
  standardAtmosphere,
  trueToEquivalent,
  validateAircraft,
  vmdMassScaling,
  vmdZeroLiftDragScaling,
} from "@/lib/aero";
import { anyAircraft, anyAltitude, anyIsaDeviation, anyLoadFactor, anySpeed } from "./fixtures";
import { expectAllFinite, expectRelative } from "./helpers";

// Invariants of the model over the whole valid input domain (fast-check picks the inputs; a failure prints the
// seed and the shrunk counterexample).

const conditions = fc.record({ altitudeM: anyAltitude, isaDeviationK: anyIsaDeviation, loadFactor: anyLoadFactor });

describe("Vmd is the bottom of the drag curve", () => {
  it("total drag at Vmd is the minimum of a finely sampled curve from Vmd/4 to 4 Vmd", () => {
    fc.assert(
      fc.property(anyAircraft, conditions, (plane, c) => {
        const vmd = minimumDragSpeed(plane, c);
        const lo = vmd.equivalentAirspeedMs / 4;
        const hi = vmd.equivalentAirspeedMs * 4;
        fc.pre(lo >= LIMITS.minSpeedMs.min && hi <= LIMITS.maxSpeedMs.max);
        const n = 3001;
        const set = sampleCurves([{ aircraft: plane, ...c }], { minSpeedMs: lo, maxSpeedMs: hi, points: n });
        const drag = set.cases[0]!.totalDragN;
        let min = Number.POSITIVE_INFINITY;
        let argmin = -1;
        for (let i = 0; i < n; i++) {
          if (drag[i]! < min) {
            min = drag[i]!;
            argmin = i;
          }
        }
        // No sample is below Dmin (beyond rounding) …
        expect(min).toBeGreaterThanOrEqual(vmd.totalDragN * (1 - 1e-12));
        // … the best sample is as close to Dmin as the grid allows (D = Dmin (1 + 2 eps^2) near Vmd) …
        expect(min).toBeLessThanOrEqual(vmd.totalDragN * (1 + 1e-5));
        // … and it lies within one grid step of Vmd.
        const step = (hi - lo) / (n - 1);
        expect(Math.abs(set.speedsMs[argmin]! - vmd.equivalentAirspeedMs)).toBeLessThanOrEqual(step * 1.0000001);
      }),
      { numRuns: 150, maxSkipsPerRun: 1000 },
    );
  });
});

describe("scaling laws", () => {
  it("Vmd as EAS does not depend on altitude or ISA deviation; Vmd as TAS grows as 1/sqrt(sigma)", () => {
    fc.assert(
      fc.property(anyAircraft, anyAltitude, anyIsaDeviation, anyAltitude, anyIsaDeviation, (plane, h1, d1, h2, d2) => {
        const a = minimumDragSpeed(plane, { altitudeM: h1, isaDeviationK: d1 });
        const b = minimumDragSpeed(plane, { altitudeM: h2, isaDeviationK: d2 });
        expectRelative(a.equivalentAirspeedMs, b.equivalentAirspeedMs, 1e-12);
        expectRelative(a.totalDragN, b.totalDragN, 1e-12);
        const ratio = Math.sqrt(standardAtmosphere(h1, d1).densityRatio / standardAtmosphere(h2, d2).densityRatio);
        expectRelative(b.trueAirspeedMs / a.trueAirspeedMs, ratio, 1e-12);
      }),
      { numRuns: 300 },
    );
  });

  it("Vmd scales with the square root of mass; (L/D)max does not change", () => {
    fc.assert(
      fc.property(anyAircraft, conditions, fc.double({ min: 0.05, max: 20, noNaN: true }), (plane, c, factor) => {
        const massKg = plane.massKg * factor;
        fc.pre(massKg >= LIMITS.massKg.min && massKg <= LIMITS.massKg.max);
        const a = minimumDragSpeed(plane, c);
        const b = minimumDragSpeed({ ...plane, massKg }, c);
        expectRelative(b.trueAirspeedMs / a.trueAirspeedMs, Math.sqrt(factor), 1e-12);
        expectRelative(b.equivalentAirspeedMs / a.equivalentAirspeedMs, vmdMassScaling(factor), 1e-12);
        expectRelative(b.maxLiftToDrag, a.maxLiftToDrag, 1e-12);
        expectRelative(b.totalDragN / a.totalDragN, factor, 1e-12);
      }),
      { numRuns: 300, maxSkipsPerRun: 1000 },
    );
  });

  it("a configuration with more CD0 (gear, flaps) lowers Vmd as CD0^(-1/4)", () => {
    fc.assert(
      fc.property(anyAircraft, conditions, fc.double({ min: 1.01, max: 4, noNaN: true }), (plane, c, factor) => {
        const cd0 = plane.zeroLiftDragCoefficient * factor;
        fc.pre(cd0 <= LIMITS.zeroLiftDragCoefficient.max);
        const clean = minimumDragSpeed(plane, c);
        const dirty = minimumDragSpeed({ ...plane, zeroLiftDragCoefficient: cd0 }, c);
        expect(dirty.trueAirspeedMs).toBeLessThan(clean.trueAirspeedMs);
        expectRelative(dirty.trueAirspeedMs / clean.trueAirspeedMs, vmdZeroLiftDragScaling(factor), 1e-12);
      }),
      { numRuns: 300, maxSkipsPerRun: 1000 },
    );
  });

  it("stall speed scales with the square root of the load factor, and Vmp / Vmd = 3^(-1/4)", () => {
    fc.assert(
      fc.property(anyAircraft, conditions, (plane, c) => {
        const oneG = stallSpeed(plane, { ...c, loadFactor: 1 });
        const nG = stallSpeed(plane, c);
        expectRelative(nG.equivalentAirspeedMs / oneG.equivalentAirspeedMs, Math.sqrt(c.loadFactor), 1e-12);
        expectRelative(minimumPowerSpeed(plane, c).trueAirspeedMs / minimumDragSpeed(plane, c).trueAirspeedMs, Math.pow(3, -0.25), 1e-12);
        expectRelative(jetBestRangeSpeed(plane, c).trueAirspeedMs / minimumDragSpeed(plane, c).trueAirspeedMs, Math.pow(3, 0.25), 1e-12);
      }),
      { numRuns: 300 },
    );
  });

  it("lift equals n W at every speed: CL q S = n m g0", () => {
    fc.assert(
      fc.property(anyAircraft, conditions, anySpeed, (plane, c, v) => {
        const d = dragAt(plane, { ...c, trueAirspeedMs: v });
        expectRelative(d.liftCoefficient * d.dynamicPressurePa * plane.wingAreaM2, c.loadFactor * plane.massKg * 9.80665, 1e-12);
        expectRelative(d.liftToDrag * d.totalDragN, c.loadFactor * plane.massKg * 9.80665, 1e-12);
      }),
      { numRuns: 300 },
    );
  });
});

describe("no output is NaN or Infinity for valid inputs", () => {
  it("across every function of the facade, over the whole valid domain", () => {
    fc.assert(
      fc.property(
        anyAircraft,
        conditions,
        anySpeed,
        fc.double({ min: -0.5, max: 0.5, noNaN: true }),
        fc.double({ min: 0, max: 20000, noNaN: true }),
        (plane, c, v, gustFraction, height) => {
          expectAllFinite(standardAtmosphere(c.altitudeM, c.isaDeviationK), "standardAtmosphere");
          expectAllFinite(dragAt(plane, { ...c, trueAirspeedMs: v }), "dragAt");
          expectAllFinite(minimumDragSpeed(plane, c), "minimumDragSpeed");
          expectAllFinite(minimumPowerSpeed(plane, c), "minimumPowerSpeed");
          expectAllFinite(jetBestRangeSpeed(plane, c), "jetBestRangeSpeed");
          expectAllFinite(stallSpeed(plane, c), "stallSpeed");
          expectAllFinite(bestGlide(plane, c), "bestGlide");
          expectAllFinite(glideDistance(plane, { heightM: height }), "glideDistance");
          // A gust of up to +-50 % that keeps the new speed inside the valid range.
          const target = Math.min(LIMITS.trueAirspeedMs.max, Math.max(2 * LIMITS.trueAirspeedMs.min, v * (1 + gustFraction)));
          expectAllFinite(speedStability(plane, { ...c, trueAirspeedMs: v, speedChangeMs: target - v }), "speedStability");
          expectAllFinite(equivalentToTrue(Math.min(v, 200), c.altitudeM, c.isaDeviationK), "equivalentToTrue");
          expectAllFinite(trueToEquivalent(v, c.altitudeM, c.isaDeviationK), "trueToEquivalent");
          expectAllFinite(pressureAltitudeFromPressure(standardAtmosphere(c.altitudeM).pressurePa), "pressureAltitude");
          expectAllFinite(
            sampleCurves([{ aircraft: plane, ...c }], { minSpeedMs: LIMITS.minSpeedMs.min, maxSpeedMs: Math.max(v, 0.002), points: 50 }),
            "sampleCurves",
          );
        },
      ),
      { numRuns: 500 },
    );
  });

  it("density altitude is finite or a named AeroInputError (above the 20 km ceiling)", () => {
    fc.assert(
      fc.property(anyAltitude, fc.double({ min: 100, max: 400, noNaN: true }), (pa, oat) => {
        try {
          expect(Number.isFinite(densityAltitude(pa, oat))).toBe(true);
        } catch (error) {
          expect(error).toBeInstanceOf(AeroInputError);
          expect((error as AeroInputError).field).toBe("outsideAirTemperatureK");
        }
      }),
      { numRuns: 300 },
    );
  });
});

describe("the zod schema and the runtime check agree", () => {
  const anyNumberish = fc.oneof(
    fc.double(),
    fc.constantFrom(0, -1, Number.NaN, Number.POSITIVE_INFINITY, 1e9, 0.5, 1, 1.5, 10, 30),
    fc.constantFrom("12" as unknown as number, null as unknown as number),
  );
  it("accepts and rejects the same aircraft, with the same message on the same field", () => {
    fc.assert(
      fc.property(
        fc.oneof(
          anyAircraft,
          fc.record({
            massKg: anyNumberish,
            wingAreaM2: anyNumberish,
            wingSpanM: anyNumberish,
            zeroLiftDragCoefficient: anyNumberish,
            oswaldEfficiency: anyNumberish,
            maxLiftCoefficient: anyNumberish,
          }),
        ),
        (candidate) => {
          const parsed = aircraftSchema.safeParse(candidate);
          let thrown: AeroInputError | undefined;
          try {
            validateAircraft(candidate);
          } catch (error) {
            thrown = error as AeroInputError;
          }
          expect(parsed.success).toBe(thrown === undefined);
          if (thrown !== undefined && !parsed.success) {
            const match = parsed.error.issues.find((issue) => issue.message === thrown.message);
            expect(match).toBeDefined();
            expect(match?.path).toEqual([thrown.field]);
          }
        },
      ),
      { numRuns: 500 },
    );
  });
});
