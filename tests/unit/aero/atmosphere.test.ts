import {
  ISA,
  SEA_LEVEL_DENSITY_KG_M3,
  TROPOPAUSE_PRESSURE_PA,
  densityAltitude,
  ftToM,
  inHgToPa,
  mToFt,
  paToHpa,
  paToInHg,
  pressureAltitudeFromAltimeterSetting,
  pressureAltitudeFromPressure,
  standardAtmosphere,
} from "@/lib/aero";
import { expectRelative, expectWithin } from "./helpers";

// Oracles are named beside each check, each with a section of lib/aero/REFERENCES.md: "Table" = the printed
// standard atmosphere ([ICAO] Doc 7488/3, 3rd ed., 1993; [USSA] U.S. Standard Atmosphere, 1976, Table I);
// "Memory" = recalled from the named book or table, weaker; "Derived" = recomputed from the ISA formulas with the
// arithmetic written out in REFERENCES.md. Derived checks allow half a unit in the last digit written there.

const PSI_PA = 4.4482216152605 / (0.0254 * 0.0254); // lbf/in^2 from exact lbf and inch (REFERENCES.md §4.4)
const fToK = (f: number) => ((f - 32) * 5) / 9 + 273.15;

describe("ISA defining constants (REFERENCES.md §1)", () => {
  it("sea level is 288.15 K, 101325 Pa, 1.225 kg/m3, 340.294 m/s", () => {
    // Table: [ICAO] / [USSA] Table I sea-level row (REFERENCES.md §1, §2.1).
    const sl = standardAtmosphere(0);
    expectWithin(sl.temperatureK, 288.15, 1e-9);
    expectWithin(sl.pressurePa, 101325, 1e-9);
    expectWithin(sl.densityKgM3, 1.225, 1e-6);
    expectWithin(sl.speedOfSoundMs, 340.294, 0.001);
    expect(sl.densityRatio).toBe(1);
  });

  it("the tropopause is at 11,000 m with 216.65 K and 22,632 Pa", () => {
    // Table: 11 000 m and 216.65 K ([ICAO], [USSA], REFERENCES.md §1); Memory: [USSA] prints 2.2632e4 Pa (§2.1);
    // Derived: 22 632.04 Pa (§2.2).
    expect(ISA.tropopauseAltitudeM).toBe(11000);
    expectWithin(TROPOPAUSE_PRESSURE_PA, 22632, 0.5);
    expectWithin(TROPOPAUSE_PRESSURE_PA, 22632.04, 0.005);
    const t = standardAtmosphere(11000);
    expectWithin(t.temperatureK, 216.65, 1e-9);
    expectWithin(t.pressurePa, 22632.04, 0.005);
  });

  it("the troposphere cools at 1.98 degC per 1000 ft", () => {
    // Derived: 0.0065 K/m x 304.8 m = 1.9812 K per 1 000 ft (REFERENCES.md §1, §2.1).
    const drop = standardAtmosphere(0).temperatureK - standardAtmosphere(ftToM(1000)).temperatureK;
    expectWithin(drop, 1.9812, 1e-9);
  });
});

describe("ISA table values in both layers (REFERENCES.md §2)", () => {
  it("gives the Derived rows at 1,000, 3,000, 11,000, 14,000 and 20,000 m", () => {
    // Derived: REFERENCES.md §2.2 table (working written there); tolerance half a unit in the last written digit.
    const rows = [
      { h: 1000, T: 281.65, p: 89874.56, rho: 1.111643, a: 336.434 },
      { h: 3000, T: 268.65, p: 70108.53, rho: 0.909122, a: 328.578 },
      { h: 11000, T: 216.65, p: 22632.04, rho: 0.363918, a: 295.069 },
      { h: 14000, T: 216.65, p: 14101.78, rho: 0.226753, a: 295.069 },
      { h: 20000, T: 216.65, p: 5474.88, rho: 0.088035, a: 295.069 },
    ];
    for (const r of rows) {
      const s = standardAtmosphere(r.h);
      expectWithin(s.temperatureK, r.T, 1e-9);
      expectWithin(s.pressurePa, r.p, 0.005);
      expectWithin(s.densityKgM3, r.rho, 0.0000005);
      expectWithin(s.speedOfSoundMs, r.a, 0.0005);
    }
  });

  it("agrees with the printed 20 km pressure of the tables and the Derived 3 km pressure in hPa", () => {
    // Memory: 5 474.9 Pa at 20 000 m ([USSA], REFERENCES.md §2.1); [USSA]'s R = 287.0531 gives 5 474.89 Pa and
    // ours 5 474.88 Pa (§2.2), so the printed figure is compared to +-0.05 Pa.
    expectWithin(standardAtmosphere(20000).pressurePa, 5474.9, 0.05);
    expectWithin(paToHpa(standardAtmosphere(3000).pressurePa), 701.0853, 0.00005); // Derived, §2.2: 70 108.53 Pa
  });

  it("gives the Derived rows in feet (pressure in inHg, density ratio)", () => {
    // Derived: REFERENCES.md §2.3 table; tolerance half a unit in the last written digit.
    const rows: [number, number, number, number][] = [
      [2000, 284.188, 27.8211, 0.94277],
      [4000, 280.225, 25.8418, 0.88809],
      [5000, 278.244, 24.8959, 0.86167],
      [6000, 276.263, 23.9782, 0.83586],
      [8000, 272.3, 22.225, 0.78602],
      [10000, 268.338, 20.577, 0.73848],
      [12000, 264.376, 19.0294, 0.69317],
      [14000, 260.413, 17.5774, 0.65003],
      [16000, 256.451, 16.2164, 0.60896],
    ];
    for (const [ft, T, inHg, sigma] of rows) {
      const s = standardAtmosphere(ftToM(ft));
      expectWithin(s.temperatureK, T, 0.0005);
      expectWithin(paToInHg(s.pressurePa), inHg, 0.00005);
      expectWithin(s.densityRatio, sigma, 0.000005);
    }
  });

  it("gives 41.17 degF and 12.2277 psi at 5,000 ft", () => {
    // Derived: REFERENCES.md §2.3 worked example (278.244 K = 41.17 degF; 84 307.26 Pa = 12.2277 psi).
    const s = standardAtmosphere(ftToM(5000));
    expectWithin(s.temperatureK, fToK(41.17), 0.005);
    expectWithin(s.pressurePa / PSI_PA, 12.2277, 0.00005);
    expectWithin(s.pressurePa, 84307.26, 0.005);
  });

  it("gives the 14 km values of Anderson, Introduction to Flight, Example 3.1", () => {
    // Memory: [A-IF] 8th ed., Example 3.1, p ~ 1.41e4 N/m2, rho ~ 0.227 kg/m3 (REFERENCES.md §3). Tolerance: the
    // printed 3 significant figures.
    const s = standardAtmosphere(14000);
    expectWithin(s.pressurePa, 1.41e4, 50);
    expectWithin(s.densityKgM3, 0.227, 0.0005);
  });
});

describe("ISA deviation", () => {
  it("changes temperature and density but leaves pressure unchanged", () => {
    for (const h of [-610, 0, 1524, 11000, 15000, 20000]) {
      const std = standardAtmosphere(h);
      for (const dT of [-30, -10, 15, 40]) {
        const dev = standardAtmosphere(h, dT);
        expect(dev.pressurePa).toBe(std.pressurePa);
        expectWithin(dev.temperatureK - std.temperatureK, dT, 1e-9);
        // Ideal gas at constant pressure: rho T is constant (rho = p/(R T), REFERENCES.md §2.2).
        expectRelative(dev.densityKgM3 * dev.temperatureK, std.densityKgM3 * std.temperatureK, 1e-12);
        expect(dT > 0 ? dev.densityKgM3 < std.densityKgM3 : dev.densityKgM3 > std.densityKgM3).toBe(true);
      }
    }
  });

  it("is consistent with the ideal-gas law and sigma = rho / rho0 everywhere", () => {
    for (let h = -610; h <= 20000; h += 371) {
      const s = standardAtmosphere(h, 7);
      expectRelative(s.pressurePa, s.densityKgM3 * ISA.gasConstantJKgK * s.temperatureK, 1e-12);
      expectRelative(s.densityRatio, s.densityKgM3 / SEA_LEVEL_DENSITY_KG_M3, 1e-12);
    }
  });

  it("is continuous at the tropopause", () => {
    const below = standardAtmosphere(11000 - 1e-6);
    const above = standardAtmosphere(11000 + 1e-6);
    expectRelative(above.pressurePa, below.pressurePa, 1e-9);
    expectRelative(above.densityKgM3, below.densityKgM3, 1e-9);
  });
});

describe("pressure altitude (REFERENCES.md §3)", () => {
  it("inverts the standard pressure (Derived: 84,307 Pa is 1,524.03 m = 5,000.1 ft)", () => {
    // Derived: REFERENCES.md §3, inverse of the §1 law.
    expectWithin(mToFt(pressureAltitudeFromPressure(84307)), 5000.1, 1);
    for (let h = -610; h <= 20000; h += 97) {
      expectWithin(pressureAltitudeFromPressure(standardAtmosphere(h).pressurePa), h, 1e-6);
    }
  });

  it("agrees with the NOAA pressure-altitude formula within its stated 5 ft below 10,000 ft", () => {
    // Memory: NOAA National Weather Service formula PA_ft = 145366.45 [1 - (p_hPa/1013.25)^0.190284]
    // (REFERENCES.md §3); its own error against exact ISA is at most 5 ft below 10,000 ft.
    for (let hPa = 700; hPa <= 1050; hPa += 5) {
      const noaaFt = 145366.45 * (1 - Math.pow(hPa / 1013.25, 0.190284));
      expectWithin(mToFt(pressureAltitudeFromPressure(hPa * 100)), noaaFt, 5);
    }
  });

  it("reproduces Anderson, Introduction to Flight, Example 3.2 (pressure altitude 6 km, density altitude 6.24 km)", () => {
    // Memory: [A-IF] 8th ed., Example 3.2 (p = 4.72e4 N/m2, T = 255.7 K; answers 6 km and 6.24 km read from the
    // book's table). Tolerance +-0.02 km for table interpolation (REFERENCES.md §3).
    const pa = pressureAltitudeFromPressure(4.72e4);
    expectWithin(pa, 6000, 20);
    expectWithin(densityAltitude(pa, 255.7), 6240, 20);
    // Derived: 5 997.06 m and 6 229.40 m (working in REFERENCES.md §3).
    expectWithin(pa, 5997.06, 0.005);
    expectWithin(densityAltitude(pa, 255.7), 6229.4, 0.005);
  });

  it("gives pressure altitude 5,142.37 m and density altitude 5,079.77 m at 5.3e4 Pa and 253 K", () => {
    // Derived: working in REFERENCES.md §3; tolerance half a unit in the last written digit.
    const pa = pressureAltitudeFromPressure(5.3e4);
    expectWithin(pa, 5142.37, 0.005);
    expectWithin(densityAltitude(pa, 253), 5079.77, 0.005);
  });

  it("from an altimeter setting matches the Derived exact corrections and the 1000 ft per inHg rule", () => {
    // Derived (REFERENCES.md §3): QNH 30.12 -> -183.3 ft; 29.82 -> +93.8 ft; 29.45 -> +438.6 ft (+-0.5 ft).
    expectWithin(mToFt(pressureAltitudeFromAltimeterSetting(0, inHgToPa(30.12))), -183.3, 0.5);
    expectWithin(mToFt(pressureAltitudeFromAltimeterSetting(0, inHgToPa(29.82))), 93.8, 0.5);
    expectWithin(mToFt(pressureAltitudeFromAltimeterSetting(0, inHgToPa(29.45))), 438.6, 0.5);
    // Common practice: PA = elevation + (29.92 - setting) x 1000 ft (REFERENCES.md §3). Near sea level 1 inHg is
    // about 925 ft, so the rule is ~8 % high: tolerance 10 % of the correction.
    for (const setting of [29.42, 29.62, 29.82, 30.02, 30.22, 30.42]) {
      const ruleFt = 5000 + (29.92 - setting) * 1000;
      const modelFt = mToFt(pressureAltitudeFromAltimeterSetting(ftToM(5000), inHgToPa(setting)));
      expectWithin(modelFt - 5000, ruleFt - 5000, 0.1 * Math.abs(ruleFt - 5000) + 1);
    }
  });

  it("gives 1013.25 hPa as 0 ft", () => {
    expectWithin(pressureAltitudeFromPressure(101325), 0, 1e-9);
    expectWithin(paToHpa(standardAtmosphere(0).pressurePa), 1013.25, 1e-9);
  });
});

describe("density altitude (REFERENCES.md §3)", () => {
  it("equals pressure altitude on a standard day", () => {
    for (let h = -610; h <= 20000; h += 523) {
      expectWithin(densityAltitude(h, standardAtmosphere(h).temperatureK), h, 1e-6);
    }
  });

  it("is 7,801 ft at 5,000 ft and 30 degC (Derived) and near the 120 ft per degC rule's 8,000 ft", () => {
    const da = mToFt(densityAltitude(ftToM(5000), 273.15 + 30));
    expectWithin(da, 7801, 2); // Derived, REFERENCES.md §3
    // Common practice: DA = PA + 120 ft x (OAT - ISA temperature) (REFERENCES.md §3: 5 000 ft, 30 degC -> 7 988 ft).
    // The rule runs 2-3 % high; tolerance 4 % of the rule's DA.
    const isaC = 15 - (2 * 5000) / 1000;
    const ruleFt = 5000 + 120 * (30 - isaC);
    expectWithin(da, ruleFt, 0.04 * ruleFt);
  });

  it("has the density of the standard atmosphere at the density altitude", () => {
    for (const [pa, oat] of [
      [0, 303.15],
      [1500, 250],
      [9000, 240],
      [12000, 210],
    ] as const) {
      const rho = standardAtmosphere(pa).pressurePa / (ISA.gasConstantJKgK * oat);
      expectRelative(standardAtmosphere(densityAltitude(pa, oat)).densityKgM3, rho, 1e-9);
    }
  });

  it("extends below -610 m on a very cold day instead of failing", () => {
    const da = densityAltitude(0, 273.15 - 40);
    expect(da).toBeLessThan(-610);
    expect(Number.isFinite(da)).toBe(true);
  });
});
