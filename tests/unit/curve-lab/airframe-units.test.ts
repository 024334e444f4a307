import { airframeFormSchema, formValuesFor } from "@/lib/curve-lab/schema";

const imperial = {
  ...formValuesFor(null, "imperial"),
  name: "Units trainer",
  emptyMass: 1235,
  maxMass: 1675,
  wingArea: 125,
  wingSpan: 32.2,
  oswaldEfficiency: 0.78,
  zeroLiftDragCoefficient: 0.032,
  cleanMaxLiftCoefficient: 1.45,
};

function errors(values: unknown): Record<string, string[]> {
  const r = airframeFormSchema.safeParse(values);
  if (r.success) return {};
  const out: Record<string, string[]> = {};
  for (const i of r.error.issues) (out[String(i.path[0])] ??= []).push(i.message);
  return out;
}

describe("the aircraft profile form answers in the units typed", () => {
  it("a negative pound entry is answered in pounds, never as the kilograms it became", () => {
    const e = errors({ ...imperial, emptyMass: -5 });
    expect(e.emptyMass).toEqual(["Empty mass must be a positive finite number (you entered -5 lb)"]);
    expect(e.emptyMass!.join(" ")).not.toMatch(/kg|2\.268/);
  });

  it("an out-of-range pound entry names the limits in pounds", () => {
    const e = errors({ ...imperial, emptyMass: 1235, maxMass: 3_000_000 });
    expect(e.maxMass).toEqual(["Maximum mass must be between 0.22 and 2,200,000 lb (you entered 3000000 lb)"]);
  });

  it("square feet and feet are answered in square feet and feet", () => {
    const e = errors({ ...imperial, wingArea: -1, wingSpan: 0 });
    expect(e.wingArea).toEqual(["Wing area must be a positive finite number (you entered -1 ft²)"]);
    expect(e.wingSpan![0]).toBe("Wing span must be a positive finite number (you entered 0 ft)");
  });

  it("metric entries keep the library's own words in kilograms", () => {
    const e = errors({ ...formValuesFor(null, "metric"), ...imperial, units: "metric", emptyMass: 560, maxMass: 2_000_000 });
    expect(e.maxMass![0]).toMatch(/^Maximum mass must be .*1000000 kg/);
  });
});
