import { dragAt, equivalentToTrue, ftToM, minimumDragSpeed, stallSpeed } from "@/lib/aero";
import { aircraftFor, callAnswer, defaultSpec, speedAfterGust, type AirframeSnapshot, type DemoSpec } from "@/lib/curve-lab/demo-spec";

// An invented two-seat trainer (numbers of our own, as in the demo seed).
const trainer: AirframeSnapshot = {
  id: null,
  name: "Trainer",
  emptyMassKg: 560,
  maxMassKg: 760,
  wingAreaM2: 11.6,
  wingSpanM: 9.8,
  oswaldEfficiency: 0.78,
  zeroLiftDragCoefficient: 0.032,
  configurations: {
    clean: { cd0Increment: 0, maxLiftCoefficient: 1.45 },
    gearDown: null,
    flaps1: { cd0Increment: 0.012, maxLiftCoefficient: 1.75 },
    flaps2: null,
  },
};

function specAt(altitudeM: number, axis: "equivalent" | "true"): DemoSpec {
  const s = defaultSpec(trainer);
  return { ...s, axis: { ...s.axis, speed: axis }, cases: [{ ...s.cases[0]!, altitudeM }] };
}

describe("Call it first answers", () => {
  it("Vmd and stall answers are lib/aero's own figures for the first case, on the demo's axis", () => {
    const s = specAt(ftToM(6000), "true");
    const c = s.cases[0]!;
    expect(callAnswer(s, "vmd")).toBe(
      minimumDragSpeed(aircraftFor(s.airframe, c), { altitudeM: c.altitudeM, isaDeviationK: 0 }).trueAirspeedMs,
    );
    expect(callAnswer(s, "stall")).toBe(
      stallSpeed(aircraftFor(s.airframe, c), { altitudeM: c.altitudeM, isaDeviationK: 0 }).trueAirspeedMs,
    );
  });

  it.each([
    ["EAS axis, sea level", 0, "equivalent" as const],
    ["EAS axis, 8,000 ft", ftToM(8000), "equivalent" as const],
    ["TAS axis, 8,000 ft", ftToM(8000), "true" as const],
  ])("below Vmd the speed after a gust settles where the drag again equals the thrust (%s)", (_name, altitudeM, axis) => {
    const s = specAt(altitudeM, axis);
    const c = s.cases[0]!;
    const aircraft = aircraftFor(s.airframe, c);
    const vmd = callAnswer(s, "vmd");
    const trimmed = vmd * 0.8;
    const settled = speedAfterGust(s, c, trimmed);
    expect(settled).toBeGreaterThan(vmd);
    // Independent check with the library's drag: same drag (= the thrust left set) at both speeds.
    const tas = (v: number) => (axis === "true" ? v : equivalentToTrue(v, altitudeM, 0));
    const dragTrimmed = dragAt(aircraft, { altitudeM, trueAirspeedMs: tas(trimmed) }).totalDragN;
    const dragSettled = dragAt(aircraft, { altitudeM, trueAirspeedMs: tas(settled) }).totalDragN;
    expect(Math.abs(dragSettled - dragTrimmed) / dragTrimmed).toBeLessThan(1e-9);
  });

  it("above Vmd the speed returns to the trimmed speed", () => {
    const s = specAt(0, "equivalent");
    const vmd = callAnswer(s, "vmd");
    expect(speedAfterGust(s, s.cases[0]!, vmd * 1.3)).toBe(vmd * 1.3);
    expect(callAnswer({ ...s, chosenSpeedMs: vmd * 1.3 }, "gust")).toBe(vmd * 1.3);
  });
});
