import { z } from "zod";
import { aircraftSchema, atmosphereConditionsSchema } from "@/lib/aero";
import {
  CALL_KINDS,
  CONFIGURATION_KEYS,
  CONFIGURATION_LABELS,
  CURVE_KEYS,
  MARKER_KEYS,
  type AirframeSnapshot,
  type DemoCase,
  type DemoSpec,
} from "./demo-spec";

/**
 * zod schema of a demo spec (server actions, data access, tests). Numbers are checked with
 * lib/aero's own field schemas. The inferred types must equal the plain types in demo-spec.ts
 * (checked at compile time below).
 */
const A = aircraftSchema.shape;

const configurationValues = z.object({
  /** Zero-lift drag increment over clean (0 for clean). */
  cd0Increment: z.number().min(0, "cd0Increment must be 0 or more").max(0.5, "cd0Increment must be at most 0.5"),
  maxLiftCoefficient: A.maxLiftCoefficient,
});

/** The airframe's numbers as the demo revision saw them (SI). */
export const airframeSnapshotSchema = z
  .object({
    id: z.string().uuid().nullable(),
    name: z.string().trim().min(1, "name: enter a name").max(120, "name: at most 120 characters"),
    emptyMassKg: A.massKg,
    maxMassKg: A.massKg,
    wingAreaM2: A.wingAreaM2,
    wingSpanM: A.wingSpanM,
    oswaldEfficiency: A.oswaldEfficiency,
    zeroLiftDragCoefficient: A.zeroLiftDragCoefficient,
    configurations: z.object({
      clean: configurationValues,
      gearDown: configurationValues.nullable(),
      flaps1: configurationValues.nullable(),
      flaps2: configurationValues.nullable(),
    }),
  })
  .superRefine((a, ctx) => {
    if (a.maxMassKg < a.emptyMassKg)
      ctx.addIssue({ code: "custom", path: ["maxMassKg"], message: "maxMassKg must be at least the empty mass" });
  });

export const caseSchema = z.object({
  label: z.string().trim().min(1, "label: enter a label").max(40, "label: at most 40 characters"),
  massKg: A.massKg,
  altitudeM: atmosphereConditionsSchema.shape.altitudeM,
  isaDeviationK: z.number().min(-50, "isaDeviationK must be between -50 and 50 K").max(50, "isaDeviationK must be between -50 and 50 K"),
  configuration: z.enum(CONFIGURATION_KEYS),
});

export const demoSpecSchema = z
  .object({
    version: z.literal(1),
    airframe: airframeSnapshotSchema,
    cases: z.array(caseSchema).min(1, "cases: add at least one case").max(4, "cases: at most four cases"),
    curves: z.record(z.enum(CURVE_KEYS), z.boolean()),
    markers: z.record(z.enum(MARKER_KEYS), z.boolean()),
    axis: z.object({ speed: z.enum(["equivalent", "true"]), unit: z.enum(["kt", "ms"]) }),
    range: z.object({
      minSpeedMs: z.number().min(1, "range.minSpeedMs must be at least 1 m/s").max(400),
      maxSpeedMs: z.number().min(2).max(500, "range.maxSpeedMs must be at most 500 m/s"),
    }),
    chosenSpeedMs: z.number().min(1, "chosenSpeedMs must be at least 1 m/s").max(500, "chosenSpeedMs must be at most 500 m/s"),
    /** Call it first: which answer the student places before the reveal (null: no call). */
    callKind: z.enum(CALL_KINDS).nullable(),
    notes: z.string().max(4000, "notes: at most 4000 characters"),
  })
  .superRefine((s, ctx) => {
    if (!(s.range.maxSpeedMs > s.range.minSpeedMs)) {
      ctx.addIssue({ code: "custom", path: ["range", "maxSpeedMs"], message: "range.maxSpeedMs must be greater than the minimum speed" });
    }
    s.cases.forEach((c, i) => {
      if (c.configuration !== "clean" && s.airframe.configurations[c.configuration] === null) {
        ctx.addIssue({
          code: "custom",
          path: ["cases", i, "configuration"],
          message: `${CONFIGURATION_LABELS[c.configuration]} is not a configuration of this airframe`,
        });
      }
      if (c.massKg < s.airframe.emptyMassKg * 0.999 || c.massKg > s.airframe.maxMassKg * 1.001) {
        ctx.addIssue({
          code: "custom",
          path: ["cases", i, "massKg"],
          message: "massKg must be within the airframe's empty to maximum mass",
        });
      }
    });
  });

// Compile-time proof that the schema and the plain types agree, both ways.
type Same<A, B> = [A] extends [B] ? ([B] extends [A] ? true : false) : false;
const agree: [
  Same<z.infer<typeof airframeSnapshotSchema>, AirframeSnapshot>,
  Same<z.infer<typeof caseSchema>, DemoCase>,
  Same<z.infer<typeof demoSpecSchema>, DemoSpec>,
] = [true, true, true];
void agree;
