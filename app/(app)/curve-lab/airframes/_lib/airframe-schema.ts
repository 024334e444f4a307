import { z } from "zod";
import { aircraftSchema, lbToKg, ftToM, kgToLb, mToFt, METRES_PER_FOOT } from "@/lib/aero";
import { CONFIGURATION_LABELS, type AirframeSnapshot } from "@/components/charts/demo-spec";

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

const A = aircraftSchema.shape;

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

export const airframeFormSchema = z
  .object(shape)
  .superRefine((v, ctx) => {
    const si = toSi(v);
    const imperial = v.units === "imperial";
    const conv = (x: number, unit: string) => (imperial && Number.isFinite(x) ? `${x.toPrecision(4)} ${unit}` : undefined);
    check(ctx, A.massKg, si.emptyMassKg, ["emptyMass"], LABELS.emptyMass!, "massKg", conv(si.emptyMassKg, "kg"));
    check(ctx, A.massKg, si.maxMassKg, ["maxMass"], LABELS.maxMass!, "massKg", conv(si.maxMassKg, "kg"));
    if (Number.isFinite(si.maxMassKg) && Number.isFinite(si.emptyMassKg) && si.maxMassKg < si.emptyMassKg) {
      ctx.addIssue({ code: "custom", path: ["maxMass"], message: "Maximum mass must be at least the empty mass" });
    }
    check(ctx, A.wingAreaM2, si.wingAreaM2, ["wingArea"], LABELS.wingArea!, "wingAreaM2", conv(si.wingAreaM2, "m2"));
    check(ctx, A.wingSpanM, si.wingSpanM, ["wingSpan"], LABELS.wingSpan!, "wingSpanM", conv(si.wingSpanM, "m"));
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
