import fc from "fast-check";
import { equivalentToTrue, machNumber, standardAtmosphere, trueAirspeedFactor, trueToEquivalent } from "@/lib/aero";
import { anyAltitude, anyIsaDeviation } from "./fixtures";
import { expectRelative } from "./helpers";

describe("EAS and TAS", () => {
  it("round-trip at any altitude and ISA deviation (property)", () => {
    // EAS up to 200 m/s keeps the TAS inside the library's 1000 m/s speed range even at 20 km and ISA+100.
    fc.assert(
      fc.property(fc.double({ min: 0.01, max: 200, noNaN: true }), anyAltitude, anyIsaDeviation, (eas, h, dT) => {
        expectRelative(trueToEquivalent(equivalentToTrue(eas, h, dT), h, dT), eas, 1e-12);
      }),
      { numRuns: 300 },
    );
  });

  it("TAS = EAS / sqrt(sigma), growing with altitude at a fixed EAS (property)", () => {
    fc.assert(
      fc.property(anyAltitude, anyAltitude, (h1, h2) => {
        const [lo, hi] = h1 < h2 ? [h1, h2] : [h2, h1];
        const tasLo = equivalentToTrue(50, lo);
        const tasHi = equivalentToTrue(50, hi);
        expect(tasHi).toBeGreaterThanOrEqual(tasLo);
        expectRelative(tasHi, 50 / Math.sqrt(standardAtmosphere(hi).densityRatio), 1e-12);
        expectRelative(trueAirspeedFactor(hi), tasHi / 50, 1e-12);
      }),
    );
  });

  it("warmer air at the same pressure altitude raises TAS for the same EAS", () => {
    expect(equivalentToTrue(60, 1500, 20)).toBeGreaterThan(equivalentToTrue(60, 1500, 0));
    expect(equivalentToTrue(60, 1500, -20)).toBeLessThan(equivalentToTrue(60, 1500, 0));
  });

  it("the Mach number of 100 m/s at sea level is 100 / 340.294", () => {
    // Speed of sound at sea level 340.294 m/s: ICAO Doc 7488/3 table, Derived in REFERENCES.md §1.
    expectRelative(machNumber(100, 0), 100 / 340.294, 2e-6);
  });
});
