import { Assignment } from "../models";
import { createAirframe } from "../access/curve-lab/save-airframe";
import { snapshotOf } from "@/lib/curve-lab/demo-spec";
import type { AirframeData } from "../access/curve-lab/airframes";
import { createDemo } from "../access/curve-lab/save-demo";
import { defaultSpec, type DemoSpec } from "@/lib/curve-lab/demo-spec";
import { ftToM, ktToMs } from "@/lib/aero";
import type { SeedContext } from "./extensions";

// Invented aircraft types of our own with plausible light-aircraft numbers (SI), and two demos by
// the Kestrel cohort's instructor. The first demo is assigned to the Kestrel cohort.
export const SEED_AIRFRAMES: AirframeData[] = [
  {
    name: "Larkhollow Wren LW-2 (two-seat trainer)",
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
      flaps2: { cd0Increment: 0.035, maxLiftCoefficient: 2.05 },
    },
    notes: "Fixed gear, two flap settings. Invented type for ground teaching.",
  },
  {
    name: "Tern T4 (four-seat tourer)",
    emptyMassKg: 780,
    maxMassKg: 1200,
    wingAreaM2: 16.2,
    wingSpanM: 11.0,
    oswaldEfficiency: 0.8,
    zeroLiftDragCoefficient: 0.026,
    configurations: {
      clean: { cd0Increment: 0, maxLiftCoefficient: 1.5 },
      gearDown: { cd0Increment: 0.015, maxLiftCoefficient: 1.5 },
      flaps1: { cd0Increment: 0.01, maxLiftCoefficient: 1.8 },
      flaps2: { cd0Increment: 0.03, maxLiftCoefficient: 2.1 },
    },
    notes: "Retractable gear. Invented type for ground teaching.",
  },
  {
    name: "Fenmoor Heron (touring motor glider)",
    emptyMassKg: 420,
    maxMassKg: 620,
    wingAreaM2: 15,
    wingSpanM: 16.5,
    oswaldEfficiency: 0.85,
    zeroLiftDragCoefficient: 0.018,
    configurations: { clean: { cd0Increment: 0, maxLiftCoefficient: 1.3 }, gearDown: null, flaps1: null, flaps2: null },
    notes: "Long wing, low zero-lift drag: a flat bucket. Invented type for ground teaching.",
  },
];

export async function seedCurveLab(ctx: SeedContext): Promise<void> {
  const { t, schoolId } = ctx;
  const made = [];
  for (const a of SEED_AIRFRAMES) made.push(await createAirframe(schoolId, ctx.people.instructor, a, t));
  const [wren, tern] = made.map(snapshotOf) as [ReturnType<typeof snapshotOf>, ReturnType<typeof snapshotOf>];
  const instructor = { id: ctx.people.instructor, name: "Tomasz Varga", roles: ["instructor" as const], schoolId };

  const bucket: DemoSpec = {
    ...defaultSpec(wren),
    cases: [{ label: "Wren at max mass", massKg: 760, altitudeM: 0, isaDeviationK: 0, configuration: "clean" }],
    curves: { zeroLift: true, liftDependent: true, idealInduced: false, increment: false, total: true, power: false, liftToDrag: false },
    markers: { vmd: true, vmp: true, stall: true, bestGlide: true, chosen: false },
    range: { minSpeedMs: ktToMs(40), maxSpeedMs: ktToMs(150) },
    chosenSpeedMs: ktToMs(60),
    callKind: "vmd",
    notes:
      "Zero-lift drag grows with the square of speed, lift-dependent drag falls with it; the total has a bucket whose bottom is Vmd, where the two are equal.",
  };
  const heavyLight: DemoSpec = {
    ...defaultSpec(tern),
    cases: [
      { label: "Heavy, 1,200 kg", massKg: 1200, altitudeM: 0, isaDeviationK: 0, configuration: "clean" },
      { label: "Light, 900 kg", massKg: 900, altitudeM: 0, isaDeviationK: 0, configuration: "clean" },
      { label: "Heavy at 8,000 ft", massKg: 1200, altitudeM: ftToM(8000), isaDeviationK: 0, configuration: "clean" },
    ],
    curves: { zeroLift: false, liftDependent: false, idealInduced: false, increment: false, total: true, power: false, liftToDrag: false },
    markers: { vmd: true, vmp: false, stall: true, bestGlide: false, chosen: true },
    range: { minSpeedMs: ktToMs(45), maxSpeedMs: ktToMs(170) },
    chosenSpeedMs: ktToMs(62),
    callKind: "gust",
    notes:
      "Vmd grows with the square root of weight: 10% lighter is about 5% slower. On the EAS axis altitude does not move Vmd; switch to TAS to see it move right.",
  };
  const first = await createDemo(instructor, "Why drag has a bucket", bucket, t);
  await createDemo(instructor, "Heavy vs light: where Vmd moves", heavyLight, t);

  // Assign the first demo to the Kestrel cohort, unless another area's seed already did.
  const existing = await Assignment.count({ where: { demoId: first.demoId }, transaction: t });
  if (existing === 0) {
    await Assignment.create(
      {
        schoolId,
        kind: "demo",
        briefingId: null,
        demoId: first.demoId,
        cohortId: ctx.cohorts.a,
        studentId: null,
        dueOn: ctx.day(7),
        note: "Make your call before the reveal.",
        assignedBy: ctx.people.instructor,
      },
      { transaction: t },
    );
  }
}
