import {
  AERO_LIBRARY_VERSION,
  ftToM,
  glideDistance,
  minimumDragSpeed,
  msToKt,
  speedStability,
  equivalentToTrue,
  ktToMs,
  type Aircraft,
} from "@/lib/aero";
import {
  generateQuestion,
  figureWithinTolerance,
  REFERENCE_AIRCRAFT,
  QuestionInputError,
  type AircraftSnapshot,
} from "@/lib/records/questions";
import { evaluateCheck } from "@/lib/records/outcome";

// Anderson, "Introduction to Flight", ch. 6, the CP-1 light aeroplane (REFERENCES.md §5.1): b = 35.8 ft = 10.912 m,
// S = 174 ft² = 16.165 m², W = 2,950 lb = 13 127.5 N, CD0 = 0.025, e = 0.8. The book gives no CLmax for it
// (1.4 is a value of our own; it does not enter these answers). Empty mass and the 20,000 ft ceiling are ours too.
const CP1: AircraftSnapshot = {
  name: "CP-1 (Anderson Ex. 6.7)",
  source: { kind: "reference", id: "cp-1" },
  aircraft: {
    massKg: 13127.5 / 9.80665,
    wingAreaM2: 16.165,
    wingSpanM: 10.912,
    zeroLiftDragCoefficient: 0.025,
    oswaldEfficiency: 0.8,
    maxLiftCoefficient: 1.4,
  },
  limits: { emptyMassKg: 900, maxMassKg: 13127.5 / 9.80665, ceilingFt: 20_000 },
};

/** The snapshot's aircraft for lib/aero (the reference aircraft all have a CLmax). */
const aero = (s: AircraftSnapshot): Aircraft => ({ maxLiftCoefficient: 1.4, ...s.aircraft });

describe("generated questions", () => {
  it("glide distance matches the published worked example: Anderson Ex. 6.7, CP-1, (L/D)max = 13.6, glide from 10 000 ft", () => {
    const q = generateQuestion("glide_distance", CP1, { heightFt: 10_000 });
    // Anderson Ex. 6.7 (REFERENCES.md §5.1): (L/D)max = 13.6; range = h·(L/D)max with h = 3048 m.
    const publishedRangeM = 3048 * 13.6;
    expect(q.answer.type).toBe("number");
    if (q.answer.type !== "number") return;
    expect(q.answer.unit).toBe("NM");
    // 13.6 is rounded to 3 figures, so allow 0.5 %
    expect(Math.abs(q.answer.value * 1852 - publishedRangeM) / publishedRangeM).toBeLessThan(0.005);
    // minimum glide angle atan(1/13.6) = 4.2° (Anderson Ex. 6.7, REFERENCES.md §5.1)
    const ratio = (q.answer.value * 1852) / 3048;
    expect((Math.atan(1 / ratio) * 180) / Math.PI).toBeCloseTo(4.2, 1);
  });

  it("Vmd question equals the library's answer and stores inputs, aircraft snapshot, version and tolerance", () => {
    const a = REFERENCE_AIRCRAFT[0]!;
    const q = generateQuestion("vmd", a, { massKg: 1000, altitudeFt: 5000 });
    const lib = minimumDragSpeed({ ...aero(a), massKg: 1000 }, { altitudeM: ftToM(5000) });
    expect(q.answer).toMatchObject({ type: "number", unit: "kt" });
    expect(q.answer.value).toBe(msToKt(lib.trueAirspeedMs));
    expect(q.inputs).toEqual({ massKg: 1000, altitudeFt: 5000 });
    expect(q.aircraft.aircraft).toEqual(a.aircraft);
    expect(q.libraryVersion).toBe(AERO_LIBRARY_VERSION);
    expect(q.tolerance).toEqual({ relative: 0.03 });
    expect(q.answerMode).toBe("exact");
    expect(q.aircraft.limits).toEqual(a.limits);
    expect(q.text).toContain("5,000 ft");
  });

  it("the snapshot is a copy: editing the profile afterwards does not change the stored question", () => {
    const profile: AircraftSnapshot = JSON.parse(JSON.stringify(REFERENCE_AIRCRAFT[1]));
    const q = generateQuestion("glide_distance", profile, { heightFt: 3000 });
    const before = JSON.stringify(q);
    profile.aircraft.zeroLiftDragCoefficient = 0.05;
    expect(JSON.stringify(q)).toBe(before);
  });

  it("15 % more mass raises Vmd by the square root of 1.15 (Derived: Vmd ∝ √W, REFERENCES.md §5.6)", () => {
    const a = CP1;
    const q = generateQuestion("vmd_heavier", a, { massKg: 1100 });
    const lib = minimumDragSpeed({ ...aero(a), massKg: 1100 * 1.15 }, { altitudeM: 0 });
    expect(q.answer.value).toBe(msToKt(lib.equivalentAirspeedMs));
    const base = msToKt(minimumDragSpeed({ ...aero(a), massKg: 1100 }, { altitudeM: 0 }).equivalentAirspeedMs);
    expect((q.answer.value as number) / base).toBeCloseTo(Math.sqrt(1.15), 10);
  });

  it("the stable or unstable side follows the library on either side of Vmd (regions of command, REFERENCES.md §8.1)", () => {
    const a = REFERENCE_AIRCRAFT[0]!;
    const vmdKt = msToKt(minimumDragSpeed(aero(a), { altitudeM: 0 }).equivalentAirspeedMs);
    const slow = generateQuestion("stability_side", a, { massKg: a.aircraft.massKg, altitudeFt: 0, speedKt: Math.round(vmdKt * 0.8) });
    const fast = generateQuestion("stability_side", a, { massKg: a.aircraft.massKg, altitudeFt: 0, speedKt: Math.round(vmdKt * 1.3) });
    expect(slow.answer.value).toBe("unstable");
    expect(fast.answer.value).toBe("stable");
    const lib = speedStability(aero(a), { altitudeM: ftToM(4000), trueAirspeedMs: equivalentToTrue(ktToMs(70), ftToM(4000)) });
    expect(generateQuestion("stability_side", a, { massKg: a.aircraft.massKg, altitudeFt: 4000, speedKt: 70 }).answer.value).toBe(
      lib.regime,
    );
  });

  it("glide distance equals the library's", () => {
    const a = REFERENCE_AIRCRAFT[1]!;
    const q = generateQuestion("glide_distance", a, { heightFt: 2000 });
    expect(q.answer.value).toBe(glideDistance(aero(a), { heightM: ftToM(2000) }).distanceM / 1852);
  });

  it("refuses a missing input naming the field, and judges a figure against the tolerance", () => {
    expect(() => generateQuestion("vmd", CP1, { massKg: 1000 })).toThrow(/^altitudeFt: enter a number/);
    expect(() => generateQuestion("vmd", CP1, { massKg: -3, altitudeFt: 0 })).toThrow(/^massKg: -3 kg is below the empty mass/);
    try {
      generateQuestion("vmd", CP1, { massKg: 1000 });
    } catch (e) {
      expect(e).toBeInstanceOf(QuestionInputError);
      expect((e as QuestionInputError).field).toBe("altitudeFt");
      expect((e as QuestionInputError).boxMessage).toBe("Altitude (ft): enter a number");
    }
    const q = generateQuestion("glide_distance", CP1, { heightFt: 10_000 });
    const v = q.answer.value as number;
    expect(figureWithinTolerance(q, v * 1.02)).toBe(true);
    expect(figureWithinTolerance(q, v * 1.05)).toBe(false);
  });
});

describe("the outcome rule", () => {
  const items = [
    { id: "i1", code: "AER-03", requiredLevel: "application" as const },
    { id: "i2", code: "AER-01", requiredLevel: "understanding" as const },
  ];
  it("meets the standard only when every required question is Solid and the level reaches each item's", () => {
    const solid = [
      { syllabusItemId: "i1", outcome: "solid" as const, required: true },
      { syllabusItemId: "i2", outcome: "solid" as const, required: true },
      { syllabusItemId: "i2", outcome: "shaky" as const, required: false },
    ];
    expect(evaluateCheck({ levelShown: "application", items, questions: solid }).outcome).toBe("meets");
    const low = evaluateCheck({ levelShown: "understanding", items, questions: solid });
    expect(low.outcome).toBe("not_yet");
    expect(low.items.find((i) => i.itemId === "i1")!.meets).toBe(false);
    expect(low.items.find((i) => i.itemId === "i2")!.meets).toBe(true);
    const shaky = evaluateCheck({ levelShown: "correlation", items, questions: [{ ...solid[0]!, outcome: "shaky" }, solid[1]!] });
    expect(shaky.items.map((i) => i.meets)).toEqual([false, true]);
    const unasked = evaluateCheck({ levelShown: "correlation", items, questions: [solid[0]!] });
    expect(unasked.items[1]!.reasons[0]).toMatch(/no question/);
  });
});
