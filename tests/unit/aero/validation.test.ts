import {
  AeroInputError,
  aircraftSchema,
  aspectRatio,
  bestGlide,
  curveRangeSchema,
  densityAltitude,
  dragAt,
  equivalentToTrue,
  glideDistance,
  inducedDragFactor,
  jetBestRangeSpeed,
  loadFactorForBank,
  minimumDragSpeed,
  minimumPowerSpeed,
  pressureAltitudeFromAltimeterSetting,
  pressureAltitudeFromPressure,
  sampleCurves,
  speedChangeResponse,
  speedConditionsSchema,
  speedStability,
  stallSpeed,
  standardAtmosphere,
  trueToEquivalent,
  vmdMassScaling,
  type Aircraft,
  type SpeedConditions,
} from "@/lib/aero";
import { CP1 } from "./fixtures";
import { expectInputError } from "./helpers";

// Every invalid-input rule throws AeroInputError naming the field; the zod schemas report the same message.

const GOOD: SpeedConditions = { altitudeM: 500, trueAirspeedMs: 50 };

/** Every facade function that takes an aircraft and conditions. */
const AIRCRAFT_CALLS: [string, (a: Aircraft, c: SpeedConditions) => unknown][] = [
  ["dragAt", (a, c) => dragAt(a, c)],
  ["minimumDragSpeed", (a, c) => minimumDragSpeed(a, c)],
  ["minimumPowerSpeed", (a, c) => minimumPowerSpeed(a, c)],
  ["jetBestRangeSpeed", (a, c) => jetBestRangeSpeed(a, c)],
  ["stallSpeed", (a, c) => stallSpeed(a, c)],
  ["bestGlide", (a, c) => bestGlide(a, c)],
  ["speedStability", (a, c) => speedStability(a, c)],
  ["sampleCurves", (a, c) => sampleCurves([{ aircraft: a, ...c }], { minSpeedMs: 20, maxSpeedMs: 80, points: 5 })],
];

const AIRCRAFT_RULES: [keyof Aircraft, number[], string][] = [
  ["massKg", [0, -1200, Number.NaN, Number.POSITIVE_INFINITY], "massKg must be a positive finite number"],
  ["wingAreaM2", [0, -16, Number.NaN, Number.NEGATIVE_INFINITY], "wingAreaM2 must be a positive finite number"],
  ["wingSpanM", [0, -11, Number.NaN, Number.POSITIVE_INFINITY], "wingSpanM must be a positive finite number"],
  ["zeroLiftDragCoefficient", [0, -0.02, Number.NaN], "zeroLiftDragCoefficient must be a positive finite number"],
  ["oswaldEfficiency", [0, -0.8, Number.NaN], "oswaldEfficiency must be a positive finite number"],
  ["maxLiftCoefficient", [0, -1.5, Number.NaN], "maxLiftCoefficient must be a positive finite number"],
];

describe("aircraft rules", () => {
  for (const [field, values, message] of AIRCRAFT_RULES) {
    for (const [name, call] of AIRCRAFT_CALLS) {
      it(`${name} rejects ${field} <= 0, NaN or Infinity, naming ${field}`, () => {
        for (const bad of values) {
          const error = expectInputError(() => call({ ...CP1, [field]: bad }, GOOD), field);
          expect(error.message).toBe(message);
        }
      });
    }
  }

  it("rejects an Oswald efficiency above 1 (outside (0, 1])", () => {
    for (const [, call] of AIRCRAFT_CALLS) {
      for (const bad of [1.0000001, 1.2, 5]) {
        const error = expectInputError(() => call({ ...CP1, oswaldEfficiency: bad }, GOOD), "oswaldEfficiency");
        expect(error.message).toBe("oswaldEfficiency must be between 0.1 and 1");
      }
    }
    expect(() => dragAt({ ...CP1, oswaldEfficiency: 1 }, GOOD)).not.toThrow();
  });

  it("rejects values outside the model ranges, naming the field and the range", () => {
    expect(expectInputError(() => dragAt({ ...CP1, massKg: 2e6 }, GOOD), "massKg").message).toBe(
      "massKg must be between 0.1 and 1000000 kg",
    );
    expectInputError(() => dragAt({ ...CP1, zeroLiftDragCoefficient: 2 }, GOOD), "zeroLiftDragCoefficient");
    expectInputError(() => dragAt({ ...CP1, maxLiftCoefficient: 9 }, GOOD), "maxLiftCoefficient");
  });

  it("rejects an aspect ratio outside 1 … 50 on wingSpanM", () => {
    const stubby = expectInputError(() => dragAt({ ...CP1, wingSpanM: 3 }, GOOD), "wingSpanM");
    expect(stubby.message).toMatch(/aspect ratio of 0\.557; it must be between 1 and 50/);
    expectInputError(() => dragAt({ ...CP1, wingSpanM: 40 }, GOOD), "wingSpanM");
  });

  it("rejects a missing aircraft or conditions object", () => {
    expectInputError(() => dragAt(undefined as unknown as Aircraft, GOOD), "aircraft");
    expectInputError(() => dragAt(CP1, null as unknown as SpeedConditions), "conditions");
    expectInputError(() => dragAt({ ...CP1, massKg: "1200" as unknown as number }, GOOD), "massKg");
  });
});

describe("condition rules", () => {
  it("altitude outside -610 … 20,000 m, NaN or Infinity names altitudeM", () => {
    for (const bad of [-611, 20000.5, 30000, Number.NaN, Number.POSITIVE_INFINITY]) {
      for (const [, call] of AIRCRAFT_CALLS) expectInputError(() => call(CP1, { ...GOOD, altitudeM: bad }), "altitudeM");
      expectInputError(() => standardAtmosphere(bad), "altitudeM");
      expectInputError(() => equivalentToTrue(50, bad), "altitudeM");
    }
    expect(expectInputError(() => standardAtmosphere(-1000), "altitudeM").message).toBe("altitudeM must be between -610 and 20000 m");
    expect(expectInputError(() => standardAtmosphere(Number.NaN), "altitudeM").message).toBe("altitudeM must be a finite number");
  });

  it("ISA deviation outside -100 … +100 K, NaN or Infinity names isaDeviationK", () => {
    for (const bad of [-150, 101, Number.NaN, Number.NEGATIVE_INFINITY]) {
      for (const [, call] of AIRCRAFT_CALLS) expectInputError(() => call(CP1, { ...GOOD, isaDeviationK: bad }), "isaDeviationK");
      expectInputError(() => standardAtmosphere(0, bad), "isaDeviationK");
    }
  });

  it("a true airspeed <= 0, NaN, Infinity or above 1000 m/s names trueAirspeedMs", () => {
    for (const bad of [0, -10, Number.NaN, Number.POSITIVE_INFINITY, 1001]) {
      expectInputError(() => dragAt(CP1, { ...GOOD, trueAirspeedMs: bad }), "trueAirspeedMs");
      expectInputError(() => speedStability(CP1, { ...GOOD, trueAirspeedMs: bad }), "trueAirspeedMs");
      expectInputError(() => trueToEquivalent(bad, 0), "trueAirspeedMs");
      expectInputError(() => equivalentToTrue(bad, 0), "equivalentAirspeedMs");
    }
    expect(expectInputError(() => dragAt(CP1, { ...GOOD, trueAirspeedMs: 0 }), "trueAirspeedMs").message).toBe(
      "trueAirspeedMs must be a positive finite number",
    );
    expectInputError(() => dragAt(CP1, { altitudeM: 0 } as SpeedConditions), "trueAirspeedMs");
  });

  it("a load factor <= 0, NaN or above 10 names loadFactor", () => {
    // bestGlide takes no load factor (a steady glide has L = W cos gamma), so it is not in this list.
    for (const bad of [0, -1, Number.NaN, 11]) {
      for (const [name, call] of AIRCRAFT_CALLS) {
        if (name !== "bestGlide") expectInputError(() => call(CP1, { ...GOOD, loadFactor: bad }), "loadFactor");
      }
    }
    expectInputError(() => loadFactorForBank(89), "bankAngleDeg");
  });

  it("a speed change that leaves the speed range names speedChangeMs", () => {
    expectInputError(() => speedChangeResponse(CP1, GOOD, -50), "speedChangeMs");
    expectInputError(() => speedChangeResponse(CP1, GOOD, Number.NaN), "speedChangeMs");
    expectInputError(() => speedStability(CP1, { ...GOOD, speedChangeMs: 2000 }), "speedChangeMs");
  });

  it("a glide height below 0 or above 20,000 m names heightM", () => {
    for (const bad of [-1, 25000, Number.NaN]) expectInputError(() => glideDistance(CP1, { heightM: bad }), "heightM");
  });
});

describe("atmosphere-function rules", () => {
  it("pressure altitude: a pressure <= 0, NaN or outside the model's altitudes names pressurePa", () => {
    for (const bad of [0, -5, Number.NaN, Number.POSITIVE_INFINITY, 5000, 120000]) {
      expectInputError(() => pressureAltitudeFromPressure(bad), "pressurePa");
    }
  });

  it("density altitude: bad pressure altitude names pressureAltitudeM; bad OAT names outsideAirTemperatureK", () => {
    expectInputError(() => densityAltitude(25000, 250), "pressureAltitudeM");
    for (const bad of [0, -10, 50, 500, Number.NaN]) expectInputError(() => densityAltitude(1000, bad), "outsideAirTemperatureK");
    // Hot air at 19.5 km would put the density altitude above the 20 km ceiling.
    expectInputError(() => densityAltitude(19500, 300), "outsideAirTemperatureK");
  });

  it("altimeter setting: bad values name altimeterSettingPa; an out-of-range result names elevationM", () => {
    for (const bad of [0, Number.NaN, 50000, 200000]) {
      expectInputError(() => pressureAltitudeFromAltimeterSetting(0, bad), "altimeterSettingPa");
    }
    expectInputError(() => pressureAltitudeFromAltimeterSetting(-600, 105000), "elevationM");
  });
});

describe("helper and curve-range rules", () => {
  it("aspectRatio and inducedDragFactor name their inputs", () => {
    expectInputError(() => aspectRatio(0, 16), "wingSpanM");
    expectInputError(() => aspectRatio(10, Number.NaN), "wingAreaM2");
    expectInputError(() => inducedDragFactor(7, 0), "oswaldEfficiency");
    expectInputError(() => inducedDragFactor(7, 1.1), "oswaldEfficiency");
    expectInputError(() => inducedDragFactor(-7, 0.8), "aspectRatio");
  });

  it("vmdMassScaling names massRatio", () => {
    expectInputError(() => vmdMassScaling(0), "massRatio");
    expectInputError(() => vmdMassScaling(Number.NaN), "massRatio");
  });

  it("sampleCurves names a bad range field", () => {
    const cases = [{ aircraft: CP1, altitudeM: 0 }];
    expectInputError(() => sampleCurves(cases, { minSpeedMs: 0, maxSpeedMs: 80, points: 5 }), "minSpeedMs");
    expectInputError(() => sampleCurves(cases, { minSpeedMs: 20, maxSpeedMs: Number.POSITIVE_INFINITY, points: 5 }), "maxSpeedMs");
    expectInputError(() => sampleCurves(cases, { minSpeedMs: 80, maxSpeedMs: 20, points: 5 }), "maxSpeedMs");
    expectInputError(() => sampleCurves(cases, { minSpeedMs: 20, maxSpeedMs: 80, points: 1 }), "points");
    expectInputError(() => sampleCurves(cases, { minSpeedMs: 20, maxSpeedMs: 80, points: 10.5 }), "points");
    expectInputError(
      () => sampleCurves(cases, { minSpeedMs: 20, maxSpeedMs: 80, points: 5, speedAxis: "indicated" as "true" }),
      "speedAxis",
    );
    expectInputError(() => sampleCurves("x" as unknown as [], { minSpeedMs: 20, maxSpeedMs: 80, points: 5 }), "cases");
  });

  it("AeroInputError is an Error with name, field, path and value", () => {
    const error = expectInputError(() => dragAt({ ...CP1, massKg: -3 }, GOOD), "massKg");
    expect(error).toBeInstanceOf(Error);
    expect(error.name).toBe("AeroInputError");
    expect(error.path).toEqual(["massKg"]);
    expect(error.value).toBe(-3);
  });
});

describe("zod schemas give the same messages", () => {
  it("aircraftSchema reports each rule on its field", () => {
    for (const [field, values, message] of AIRCRAFT_RULES) {
      for (const bad of values) {
        const result = aircraftSchema.safeParse({ ...CP1, [field]: bad });
        expect(result.success).toBe(false);
        expect(result.error?.issues).toEqual(expect.arrayContaining([expect.objectContaining({ path: [field], message })]));
      }
    }
    const ar = aircraftSchema.safeParse({ ...CP1, wingSpanM: 3 });
    expect(ar.error?.issues[0]?.path).toEqual(["wingSpanM"]);
    expect(aircraftSchema.safeParse(CP1).success).toBe(true);
  });

  it("speedConditionsSchema and curveRangeSchema mirror the runtime checks", () => {
    expect(speedConditionsSchema.safeParse(GOOD).success).toBe(true);
    const noSpeed = speedConditionsSchema.safeParse({ altitudeM: 0 });
    expect(noSpeed.error?.issues[0]?.path).toEqual(["trueAirspeedMs"]);
    const high = speedConditionsSchema.safeParse({ ...GOOD, altitudeM: 21000 });
    expect(high.error?.issues[0]?.message).toBe(expectInputError(() => dragAt(CP1, { ...GOOD, altitudeM: 21000 }), "altitudeM").message);
    const reversed = curveRangeSchema.safeParse({ minSpeedMs: 80, maxSpeedMs: 20, points: 5 });
    expect(reversed.error?.issues[0]?.path).toEqual(["maxSpeedMs"]);
    expect(curveRangeSchema.safeParse({ minSpeedMs: 20, maxSpeedMs: 80, points: 2.5 }).success).toBe(false);
  });

  it("errors thrown are AeroInputError, never a plain Error or a NaN result", () => {
    expect(() => minimumDragSpeed({ ...CP1, oswaldEfficiency: Number.NaN }, GOOD)).toThrow(AeroInputError);
  });
});
