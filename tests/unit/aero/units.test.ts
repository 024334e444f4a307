import fc from "fast-check";
import Qty from "js-quantities";
import {
  celsiusToKelvin,
  ftToM,
  hpToW,
  hpaToPa,
  inHgToPa,
  kelvinToCelsius,
  kgToLb,
  kmhToMs,
  ktToMs,
  lbToKg,
  lbfToN,
  mToFt,
  massToWeightN,
  msToKmh,
  msToKt,
  msToMph,
  mphToMs,
  nToLbf,
  paToHpa,
  paToInHg,
  wToHp,
} from "@/lib/aero";
import { expectInputError, expectRelative, expectWithin } from "./helpers";

type Converter = (x: number) => number;

// Each pair: library converter, its inverse, js-quantities units, and the relative tolerance set by the
// precision of js-quantities' own factor (the installed npm package's unit definitions, REFERENCES.md §11):
// knot 0.514444444 (8.6e-10), kph 0.277777778 (8e-10), lbf 4.448222 (8.6e-8), hp 745.699872 (5.7e-10),
// inHg 3386.3881472 (2.5e-7 from the conventional 3386.389); ft, mph, lb, hPa are exact there.
const PAIRS: { name: string; to: Converter; from: Converter; qtyFrom: string; qtyTo: string; tol: number }[] = [
  { name: "kt -> m/s", to: ktToMs, from: msToKt, qtyFrom: "kt", qtyTo: "m/s", tol: 1e-8 },
  { name: "km/h -> m/s", to: kmhToMs, from: msToKmh, qtyFrom: "kph", qtyTo: "m/s", tol: 1e-8 },
  { name: "mph -> m/s", to: mphToMs, from: msToMph, qtyFrom: "mph", qtyTo: "m/s", tol: 1e-12 },
  { name: "ft -> m", to: ftToM, from: mToFt, qtyFrom: "ft", qtyTo: "m", tol: 1e-12 },
  { name: "lb -> kg", to: lbToKg, from: kgToLb, qtyFrom: "lb", qtyTo: "kg", tol: 1e-12 },
  { name: "lbf -> N", to: lbfToN, from: nToLbf, qtyFrom: "lbf", qtyTo: "N", tol: 2e-7 },
  { name: "hp -> W", to: hpToW, from: wToHp, qtyFrom: "hp", qtyTo: "W", tol: 1e-8 },
  { name: "inHg -> Pa", to: inHgToPa, from: paToInHg, qtyFrom: "inHg", qtyTo: "Pa", tol: 5e-7 },
  { name: "hPa -> Pa", to: hpaToPa, from: paToHpa, qtyFrom: "hPa", qtyTo: "Pa", tol: 1e-12 },
];

const wideValue = fc.double({ min: -1e12, max: 1e12, noNaN: true, noDefaultInfinity: true });
// js-quantities returns NaN for subnormal inputs, so its cross-check skips magnitudes below 1e-100.
const crossCheckValue = wideValue.filter((x) => x === 0 || Math.abs(x) >= 1e-100);

describe("unit conversions against js-quantities (independent npm library)", () => {
  for (const p of PAIRS) {
    it(`${p.name} agrees with js-quantities within ${p.tol} relative`, () => {
      fc.assert(
        fc.property(crossCheckValue, (x) => {
          const expected = new Qty(x, p.qtyFrom).to(p.qtyTo).scalar;
          const actual = p.to(x);
          expect(Math.abs(actual - expected)).toBeLessThanOrEqual(p.tol * Math.abs(expected) + 1e-300);
          const back = new Qty(actual, p.qtyTo).to(p.qtyFrom).scalar;
          expect(Math.abs(p.from(actual) - back)).toBeLessThanOrEqual(p.tol * Math.abs(back) + 1e-300);
        }),
        { numRuns: 200 },
      );
    });
  }

  it("degC -> K agrees with js-quantities tempC/tempK", () => {
    fc.assert(
      fc.property(fc.double({ min: -273.15, max: 1e6, noNaN: true }), (c) => {
        expectWithin(celsiusToKelvin(c), new Qty(c, "tempC").to("tempK").scalar, 1e-9 * Math.max(1, Math.abs(c)));
      }),
    );
  });
});

describe("unit conversions against published exact factors", () => {
  it("1 kt = 1.852 km/h exactly, 1.150779 mph and 1.687810 ft/s", () => {
    // Derived from the exact definitions (REFERENCES.md §4.4): 1852/1000 = 1.852; 1852/1609.344 = 1.1507794;
    // 1852/3600/0.3048 = 1.6878099.
    expectWithin(msToKmh(ktToMs(1)), 1.852, 1e-15);
    expectWithin(msToMph(ktToMs(1)), 1.150779, 5e-7);
    expectWithin(mToFt(ktToMs(1)), 1.68781, 5e-7);
  });

  it("1 lbf is the weight of 1 lb under standard gravity", () => {
    expectRelative(lbfToN(1), massToWeightN(lbToKg(1)), 1e-15);
  });

  it("1 hp = 550 ft.lbf/s", () => {
    expectRelative(wToHp(lbfToN(550) * ftToM(1)), 1, 1e-15);
  });
});

describe("unit conversions round-trip (property)", () => {
  const all: [string, Converter, Converter][] = [
    ...PAIRS.map((p): [string, Converter, Converter] => [p.name, p.to, p.from]),
    ["degC -> K", celsiusToKelvin, kelvinToCelsius],
  ];
  for (const [name, to, from] of all) {
    it(`${name} and back returns the input`, () => {
      fc.assert(
        fc.property(wideValue, (x) => {
          const round = from(to(x));
          expect(Math.abs(round - x)).toBeLessThanOrEqual(1e-15 * Math.abs(x) + (name.startsWith("degC") ? 1e-12 : 1e-300));
          const reverse = to(from(x));
          expect(Math.abs(reverse - x)).toBeLessThanOrEqual(1e-15 * Math.abs(x) + (name.startsWith("degC") ? 1e-12 : 1e-300));
        }),
        { numRuns: 300 },
      );
    });
  }
});

describe("unit conversions reject non-finite input", () => {
  it.each([
    ["ktToMs", ktToMs],
    ["msToKt", msToKt],
    ["ftToM", ftToM],
    ["mToFt", mToFt],
    ["lbToKg", lbToKg],
    ["kgToLb", kgToLb],
    ["lbfToN", lbfToN],
    ["nToLbf", nToLbf],
    ["hpToW", hpToW],
    ["wToHp", wToHp],
    ["kmhToMs", kmhToMs],
    ["mphToMs", mphToMs],
  ] as const)("%s throws AeroInputError(field 'value') for NaN, Infinity and magnitudes beyond 1e300", (_name, fn) => {
    for (const bad of [Number.NaN, Number.POSITIVE_INFINITY, Number.NEGATIVE_INFINITY, 2e300, -2e300]) {
      expectInputError(() => fn(bad), "value");
    }
  });
});
