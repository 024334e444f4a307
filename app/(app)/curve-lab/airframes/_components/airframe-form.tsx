"use client";
import { useState } from "react";
import { useRouter } from "next/navigation";
import { useForm, useWatch, type FieldPath } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import { kgToLb, lbToKg, ftToM, mToFt, METRES_PER_FOOT } from "@/lib/aero";
import { CONFIGURATION_LABELS } from "@/lib/curve-lab/demo-spec";
import { airframeFormSchema, OPTIONAL_CONFIGURATIONS, type AirframeFormInput } from "@/lib/curve-lab/schema";
import { createAirframeAction, updateAirframeAction } from "../actions";

type S = typeof airframeFormSchema;

/** Create or edit an aircraft profile; validated with lib/aero's schemas here and again on the server. */
export function AirframeForm({ airframeId, defaults }: { airframeId: string | null; defaults: AirframeFormInput }) {
  const router = useRouter();
  const [message, setMessage] = useState<string | null>(null);
  // One idempotency key per form instance: a retried "create" makes one profile.
  const [idempotencyKey] = useState(() => crypto.randomUUID());
  const form = useForm<z.input<S>, unknown, z.output<S>>({
    resolver: zodResolver(airframeFormSchema),
    defaultValues: defaults,
    mode: "onBlur",
  });
  const { register, handleSubmit, formState, setError, getValues, setValue, control } = form;
  const errors = formState.errors;
  const units = useWatch({ control, name: "units" });
  const imperial = units === "imperial";
  const [gearDown, flaps1, flaps2] = useWatch({ control, name: ["gearDown.present", "flaps1.present", "flaps2.present"] });
  const present = { gearDown, flaps1, flaps2 };

  function switchUnits(next: "imperial" | "metric") {
    if (next === getValues("units")) return;
    const conv = (name: "emptyMass" | "maxMass" | "wingArea" | "wingSpan", f: (x: number) => number, digits: number) => {
      const raw = getValues(name);
      const x = Number(raw);
      if (raw !== "" && Number.isFinite(x)) setValue(name, Number(f(x).toFixed(digits)));
    };
    const toMetric = next === "metric";
    conv("emptyMass", toMetric ? lbToKg : kgToLb, 1);
    conv("maxMass", toMetric ? lbToKg : kgToLb, 1);
    conv("wingArea", (x) => (toMetric ? x * METRES_PER_FOOT ** 2 : x / METRES_PER_FOOT ** 2), 2);
    conv("wingSpan", toMetric ? ftToM : mToFt, 2);
    setValue("units", next);
  }

  const onSubmit = handleSubmit(async (_output, event) => {
    setMessage(null);
    // The server gets the raw form values and validates them with the same schema.
    const values = getValues();
    const result = airframeId
      ? await updateAirframeAction({ airframeId, values })
      : await createAirframeAction({ ...values, idempotencyKey });
    if (!result.ok) {
      for (const [path, msgs] of Object.entries(result.fieldErrors ?? {})) {
        const field = path.replace(/^values\./, "") as FieldPath<z.input<S>>;
        setError(field, { type: "server", message: msgs[0] });
      }
      setMessage(result.message);
      return;
    }
    event?.preventDefault();
    router.push(`/curve-lab/airframes/${result.data.id}`);
    router.refresh();
  });

  const err = (path: string): string | undefined => {
    const parts = path.split(".");
    let e: unknown = errors;
    for (const p of parts) e = (e as Record<string, unknown> | undefined)?.[p];
    return (e as { message?: string } | undefined)?.message;
  };
  const field = (name: FieldPath<z.input<S>>, label: string, unit: string, opts: { step?: string; disabled?: boolean } = {}) => {
    const id = `af-${name.replace(/\./g, "-")}`;
    const e = err(name);
    return (
      <div>
        <label htmlFor={id} className="field-label">
          {label}
          {unit && ` (${unit})`}
        </label>
        <input
          id={id}
          type="number"
          inputMode="decimal"
          step={opts.step ?? "any"}
          disabled={opts.disabled}
          className="field-input num disabled:bg-paper-deep disabled:text-ink-faint"
          aria-invalid={e ? true : undefined}
          aria-describedby={e ? `${id}-error` : undefined}
          {...register(name)}
        />
        {e && (
          <p id={`${id}-error`} className="field-error" data-testid={`error-${name}`}>
            {e}
          </p>
        )}
      </div>
    );
  };

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" data-testid="airframe-form">
      <section className="card space-y-3" aria-labelledby="af-general">
        <h2 id="af-general">Profile</h2>
        <div>
          <label htmlFor="af-name" className="field-label">
            Name
          </label>
          <input
            id="af-name"
            className="field-input"
            aria-invalid={errors.name ? true : undefined}
            aria-describedby={errors.name ? "af-name-error" : undefined}
            {...register("name")}
          />
          {errors.name && (
            <p id="af-name-error" className="field-error" data-testid="error-name">
              {errors.name.message}
            </p>
          )}
        </div>
        <fieldset>
          <legend className="field-label">Units</legend>
          <div className="flex flex-wrap gap-4">
            <label className="flex min-h-touch items-center gap-2">
              <input type="radio" className="h-5 w-5" checked={imperial} onChange={() => switchUnits("imperial")} /> lb, ft, ft²
            </label>
            <label className="flex min-h-touch items-center gap-2">
              <input type="radio" className="h-5 w-5" checked={!imperial} onChange={() => switchUnits("metric")} /> kg, m, m²
            </label>
          </div>
        </fieldset>
        <div className="grid gap-3 sm:grid-cols-2">
          {field("emptyMass", "Empty mass", imperial ? "lb" : "kg")}
          {field("maxMass", "Maximum mass", imperial ? "lb" : "kg")}
          {field("wingArea", "Wing area", imperial ? "ft²" : "m²")}
          {field("wingSpan", "Wing span", imperial ? "ft" : "m")}
          {field("oswaldEfficiency", "Oswald efficiency e", "")}
          {field("zeroLiftDragCoefficient", "Zero-lift drag coefficient CD0, clean", "")}
          {field("cleanMaxLiftCoefficient", "CLmax, clean", "")}
        </div>
      </section>
      <section className="card space-y-3" aria-labelledby="af-configs">
        <h2 id="af-configs">Other configurations</h2>
        <p className="text-caption text-ink-soft">Each adds its own zero-lift drag increment to the clean CD0 and has its own CLmax.</p>
        <div className="grid gap-3 md:grid-cols-3">
          {OPTIONAL_CONFIGURATIONS.map((k) => (
            <fieldset key={k} className="space-y-2 rounded-md border border-paper-edge p-3">
              <legend className="px-1 font-semibold">{CONFIGURATION_LABELS[k]}</legend>
              <label className="flex min-h-touch items-center gap-2">
                <input type="checkbox" className="h-5 w-5" {...register(`${k}.present`)} /> This type has it
              </label>
              {field(`${k}.cd0Increment`, "CD0 increment", "", { disabled: !present[k] })}
              {field(`${k}.maxLiftCoefficient`, "CLmax", "", { disabled: !present[k] })}
            </fieldset>
          ))}
        </div>
      </section>
      <section className="card space-y-2">
        <label htmlFor="af-notes" className="field-label">
          Notes
        </label>
        <textarea id="af-notes" className="field-input min-h-24 py-2" {...register("notes")} />
        {errors.notes && <p className="field-error">{errors.notes.message}</p>}
      </section>
      <div className="flex flex-wrap items-center gap-3">
        <button type="submit" className="btn-primary" disabled={formState.isSubmitting}>
          {airframeId ? "Save changes" : "Create profile"}
        </button>
        <p aria-live="polite" className="field-error" data-testid="form-message">
          {message ?? (Object.keys(errors).length > 0 ? "Some fields need attention: nothing was saved." : "")}
        </p>
      </div>
    </form>
  );
}
