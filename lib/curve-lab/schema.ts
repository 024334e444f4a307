import { z } from "zod";
import {
  aircraftSchema,
  atmosphereConditionsSchema,
  lbToKg,
  ftToM,
  kgToLb,
  mToFt,
  LIMITS,
  METRES_PER_FOOT,
  type NumberLimit,
} from "@/lib/aero";
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

// Curve Lab's one schema module: the demo spec, the aircraft profile form and the inputs of the
// Curve Lab server actions. Forms (zodResolver) and server actions both use it. The builder's
// browser code must not import this file (it keeps zod out of that bundle): it uses demo-spec.ts.

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

// ---- aircraft profile form ---------------------------------------------------------------------

/**
 * The one schema of the aircraft profile form, used by the client form (zodResolver) and the
 * server actions. Inputs arrive in the instructor's units (lb, ft, ft²) or metric (kg, m, m²);
 * each number is converted to SI and checked with lib/aero's own schemas, and a failure is
 * reported on the form field that holds it. The output is the profile in SI units.
 */

export const OPTIONAL_CONFIGURATIONS = ["gearDown", "flaps1", "flaps2"] as const;
export type OptionalConfiguration = (typeof OPTIONAL_CONFIGURATIONS)[number];

const num = z.coerce.number({ error: "Enter a number" });

const configurationInput = z.object({
  present: z.boolean(),
  cd0Increment: num,
  maxLiftCoefficient: num,
});

const shape = {
  name: z.string().trim().min(1, "Enter a name for the profile").max(120, "Name: at most 120 characters"),
  units: z.enum(["imperial", "metric"]),
  emptyMass: num,
  maxMass: num,
  wingArea: num,
  wingSpan: num,
  oswaldEfficiency: num,
  zeroLiftDragCoefficient: num,
  cleanMaxLiftCoefficient: num,
  gearDown: configurationInput,
  flaps1: configurationInput,
  flaps2: configurationInput,
  notes: z.string().max(4000, "Notes: at most 4000 characters"),
};

const LABELS: Record<string, string> = {
  emptyMass: "Empty mass",
  maxMass: "Maximum mass",
  wingArea: "Wing area",
  wingSpan: "Wing span",
  oswaldEfficiency: "Oswald efficiency",
  zeroLiftDragCoefficient: "Zero-lift drag coefficient",
  cleanMaxLiftCoefficient: "CLmax (clean)",
};

function toSi(v: { units: "imperial" | "metric"; emptyMass: number; maxMass: number; wingArea: number; wingSpan: number }) {
  const imperial = v.units === "imperial";
  return {
    emptyMassKg: imperial ? lbToKg(v.emptyMass) : v.emptyMass,
    maxMassKg: imperial ? lbToKg(v.maxMass) : v.maxMass,
    wingAreaM2: imperial ? v.wingArea * METRES_PER_FOOT * METRES_PER_FOOT : v.wingArea,
    wingSpanM: imperial ? ftToM(v.wingSpan) : v.wingSpan,
  };
}

/** Runs a lib/aero field schema and re-words its message for the form field `path`. */
function check(
  ctx: z.RefinementCtx,
  schema: z.ZodType,
  value: number,
  path: (string | number)[],
  label: string,
  libField: string,
  converted?: string,
) {
  const r = schema.safeParse(value);
  if (r.success) return;
  const message = (r.error.issues[0]?.message ?? "is invalid").replace(libField, label);
  ctx.addIssue({ code: "custom", path, message: converted ? `${message} (entered value is ${converted})` : message });
}

const sig3 = new Intl.NumberFormat("en-GB", { maximumSignificantDigits: 3 });

/**
 * A measured field (mass, area, span) checked against lib/aero's limit on its SI value. Metric
 * entries get lib/aero's own words; imperial entries are answered in the unit typed: the limits
 * converted back, and the value as entered.
 */
function checkMeasured(
  ctx: z.RefinementCtx,
  lim: NumberLimit,
  siValue: number,
  typed: number,
  path: string[],
  label: string,
  imperial: { unit: string; fromSi: (x: number) => number } | null,
) {
  const r = (A[lim.field as keyof typeof A] as z.ZodType).safeParse(siValue);
  if (r.success) return;
  const problem = r.error.issues[0]?.message ?? `${lim.field} is invalid`;
  let message = problem.replace(lim.field, label).replace(/ m2\b/g, " m²");
  if (imperial) {
    const inRange = lim.positive && Number.isFinite(siValue) && siValue > 0;
    message = inRange
      ? `${label} must be between ${sig3.format(imperial.fromSi(lim.min))} and ${sig3.format(imperial.fromSi(lim.max))} ${imperial.unit}`
      : problem.replace(lim.field, label);
    if (Number.isFinite(typed)) message += ` (you entered ${typed} ${imperial.unit})`;
  }
  ctx.addIssue({ code: "custom", path, message });
}

export const airframeFormSchema = z
  .object(shape)
  .superRefine((v, ctx) => {
    const si = toSi(v);
    const imperial = v.units === "imperial";
    // pound, foot and square-foot entries are answered in pounds, feet and square feet, never in the SI value they became
    const lb = imperial ? { unit: "lb", fromSi: kgToLb } : null;
    const ft = imperial ? { unit: "ft", fromSi: mToFt } : null;
    const ft2 = imperial ? { unit: "ft²", fromSi: (m2: number) => m2 / (METRES_PER_FOOT * METRES_PER_FOOT) } : null;
    checkMeasured(ctx, LIMITS.massKg, si.emptyMassKg, v.emptyMass, ["emptyMass"], LABELS.emptyMass!, lb);
    checkMeasured(ctx, LIMITS.massKg, si.maxMassKg, v.maxMass, ["maxMass"], LABELS.maxMass!, lb);
    if (Number.isFinite(si.maxMassKg) && Number.isFinite(si.emptyMassKg) && si.maxMassKg < si.emptyMassKg) {
      ctx.addIssue({ code: "custom", path: ["maxMass"], message: "Maximum mass must be at least the empty mass" });
    }
    checkMeasured(ctx, LIMITS.wingAreaM2, si.wingAreaM2, v.wingArea, ["wingArea"], LABELS.wingArea!, ft2);
    checkMeasured(ctx, LIMITS.wingSpanM, si.wingSpanM, v.wingSpan, ["wingSpan"], LABELS.wingSpan!, ft);
    check(ctx, A.oswaldEfficiency, v.oswaldEfficiency, ["oswaldEfficiency"], LABELS.oswaldEfficiency!, "oswaldEfficiency");
    check(
      ctx,
      A.zeroLiftDragCoefficient,
      v.zeroLiftDragCoefficient,
      ["zeroLiftDragCoefficient"],
      LABELS.zeroLiftDragCoefficient!,
      "zeroLiftDragCoefficient",
    );
    check(
      ctx,
      A.maxLiftCoefficient,
      v.cleanMaxLiftCoefficient,
      ["cleanMaxLiftCoefficient"],
      LABELS.cleanMaxLiftCoefficient!,
      "maxLiftCoefficient",
    );
    // The whole aircraft through lib/aero's schema: catches an impossible aspect ratio.
    const whole = aircraftSchema.safeParse({
      massKg: si.maxMassKg,
      wingAreaM2: si.wingAreaM2,
      wingSpanM: si.wingSpanM,
      zeroLiftDragCoefficient: v.zeroLiftDragCoefficient,
      oswaldEfficiency: v.oswaldEfficiency,
      maxLiftCoefficient: v.cleanMaxLiftCoefficient,
    });
    if (!whole.success) {
      for (const issue of whole.error.issues) {
        if (issue.path[0] === "wingSpanM" && issue.message.includes("aspect ratio")) {
          ctx.addIssue({
            code: "custom",
            path: ["wingSpan"],
            message: issue.message.replace("wingSpanM and wingAreaM2", "Wing span and area"),
          });
        }
      }
    }
    for (const key of OPTIONAL_CONFIGURATIONS) {
      const c = v[key];
      if (!c.present) continue;
      const label = CONFIGURATION_LABELS[key];
      if (!(Number.isFinite(c.cd0Increment) && c.cd0Increment >= 0 && c.cd0Increment <= 0.5)) {
        ctx.addIssue({ code: "custom", path: [key, "cd0Increment"], message: `${label}: drag increment must be between 0 and 0.5` });
      } else {
        check(
          ctx,
          A.zeroLiftDragCoefficient,
          v.zeroLiftDragCoefficient + c.cd0Increment,
          [key, "cd0Increment"],
          `${label}: zero-lift drag coefficient with the increment`,
          "zeroLiftDragCoefficient",
        );
      }
      check(ctx, A.maxLiftCoefficient, c.maxLiftCoefficient, [key, "maxLiftCoefficient"], `${label}: CLmax`, "maxLiftCoefficient");
    }
  })
  .transform((v): Omit<AirframeSnapshot, "id"> & { notes: string } => {
    const si = toSi(v);
    const conf = (c: z.infer<typeof configurationInput>) =>
      c.present ? { cd0Increment: c.cd0Increment, maxLiftCoefficient: c.maxLiftCoefficient } : null;
    return {
      name: v.name,
      ...si,
      oswaldEfficiency: v.oswaldEfficiency,
      zeroLiftDragCoefficient: v.zeroLiftDragCoefficient,
      configurations: {
        clean: { cd0Increment: 0, maxLiftCoefficient: v.cleanMaxLiftCoefficient },
        gearDown: conf(v.gearDown),
        flaps1: conf(v.flaps1),
        flaps2: conf(v.flaps2),
      },
      notes: v.notes,
    };
  });

export type AirframeFormInput = z.input<typeof airframeFormSchema>;
export type AirframeFormOutput = z.output<typeof airframeFormSchema>;

const round = (x: number, digits: number) => Number(x.toFixed(digits));

/** Form values (in `units`) for an existing profile, or blank values for a new one. */
export function formValuesFor(
  a: (Omit<AirframeSnapshot, "id"> & { notes: string }) | null,
  units: "imperial" | "metric" = "imperial",
): AirframeFormInput {
  const blankConf = { present: false, cd0Increment: 0, maxLiftCoefficient: 1.6 };
  if (!a) {
    return {
      name: "",
      units,
      emptyMass: "",
      maxMass: "",
      wingArea: "",
      wingSpan: "",
      oswaldEfficiency: 0.8,
      zeroLiftDragCoefficient: "",
      cleanMaxLiftCoefficient: "",
      gearDown: blankConf,
      flaps1: blankConf,
      flaps2: blankConf,
      notes: "",
    };
  }
  const imperial = units === "imperial";
  const c = (x: { cd0Increment: number; maxLiftCoefficient: number } | null) => (x ? { present: true, ...x } : blankConf);
  return {
    name: a.name,
    units,
    emptyMass: round(imperial ? kgToLb(a.emptyMassKg) : a.emptyMassKg, 1),
    maxMass: round(imperial ? kgToLb(a.maxMassKg) : a.maxMassKg, 1),
    wingArea: round(imperial ? a.wingAreaM2 / (METRES_PER_FOOT * METRES_PER_FOOT) : a.wingAreaM2, 2),
    wingSpan: round(imperial ? mToFt(a.wingSpanM) : a.wingSpanM, 2),
    oswaldEfficiency: a.oswaldEfficiency,
    zeroLiftDragCoefficient: a.zeroLiftDragCoefficient,
    cleanMaxLiftCoefficient: a.configurations.clean.maxLiftCoefficient,
    gearDown: c(a.configurations.gearDown),
    flaps1: c(a.configurations.flaps1),
    flaps2: c(a.configurations.flaps2),
    notes: a.notes,
  };
}

// ---- server action inputs -----------------------------------------------------------------------

export const demoNameSchema = z.string().trim().min(1, "Enter a name for the demo").max(120, "Name: at most 120 characters");

/** Saving from the builder: a new demo when `demoId` is null, otherwise the demo's next state. */
export const saveDemoSchema = z.object({
  demoId: z.string().uuid("demoId: not a demo id").nullable(),
  name: demoNameSchema,
  spec: demoSpecSchema,
});

export const demoIdSchema = z.object({ demoId: z.string().uuid("demoId: not a demo id") });
export const renameDemoSchema = demoIdSchema.extend({ name: demoNameSchema });

/** A student's Call it first prediction. */
export const callSchema = z.object({
  demoRevisionId: z.string().uuid("demoRevisionId: not a demo revision id"),
  kind: z.enum(CALL_KINDS, { error: "kind must be vmd, stall or gust" }),
  predictedMs: z
    .number({ error: "predictedMs must be a number" })
    .gt(0, "predictedMs must be above 0 m/s")
    .max(500, "predictedMs must be at most 500 m/s"),
});

export const airframeIdSchema = z.object({ airframeId: z.string().uuid("airframeId: not an aircraft profile id") });
export const updateAirframeSchema = z.object({ airframeId: airframeIdSchema.shape.airframeId, values: airframeFormSchema });
export const retireAirframeSchema = airframeIdSchema.extend({ retired: z.boolean() });
