import { stallSpeed, validityText } from "@/lib/aero";
import { aircraftFor, defaultSpec, speedInUnit, type AirframeSnapshot } from "@/lib/curve-lab/demo-spec";
import { CSV_POINTS, curvesTable } from "@/lib/curve-lab/curves-csv";

// Issue 12 leftover: the exported curve data says, row by row, where a figure leaves the model's
// validity (below the stall, above Mach 0.3) instead of printing it bare.

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
    flaps1: null,
    flaps2: null,
  },
};

describe("the curves' CSV table", () => {
  it("carries one validity column per case, flagging exactly the rows below the stall", () => {
    const spec = defaultSpec(trainer);
    const { header, rows } = curvesTable(spec);
    expect(header).toHaveLength(1 + 8 * spec.cases.length);
    expect(header[8]).toBe(`${spec.cases[0]!.label}: model validity`);
    expect(rows).toHaveLength(CSV_POINTS);
    const c = spec.cases[0]!;
    const vs = speedInUnit(stallSpeed(aircraftFor(trainer, c), { altitudeM: c.altitudeM }).equivalentAirspeedMs, spec.axis.unit);
    const below = rows.filter((r) => Number(r[0]) < vs - 0.01);
    const above = rows.filter((r) => Number(r[0]) > vs + 0.01);
    expect(below.length).toBeGreaterThan(0);
    expect(above.length).toBeGreaterThan(0);
    for (const r of below) expect(r[8]).toMatch(new RegExp(`^${validityText(["below_stall"])}$|^${validityText(["far_below_stall"])}$`));
    for (const r of above) expect(r[8]).toBe("");
  });
});
