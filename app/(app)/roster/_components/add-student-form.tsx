"use client";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import { addStudentSchema } from "@/lib/roster/schema";
import { ChoiceField } from "@/components/search-picker";
import type { PickerChoices } from "@/lib/directory/picker";
import { addStudentAction } from "../actions";

type In = z.input<typeof addStudentSchema>;
type Out = z.output<typeof addStudentSchema>;

/** `choices`: the cohorts the caller may add to, listed while few, else searched. */
export function AddStudentForm({ choices }: { choices: PickerChoices }) {
  const first = choices.kind === "list" ? choices.rows[0]?.id : undefined;
  const router = useRouter();
  const [msg, setMsg] = useState<{ ok: boolean; text: string } | null>(null);
  const {
    register,
    handleSubmit,
    reset,
    setError,
    setValue,
    formState: { errors, isSubmitting },
  } = useForm<In, unknown, Out>({
    resolver: zodResolver(addStudentSchema),
    defaultValues: { name: "", email: "", cohortId: first ?? "", sponsorName: "", sponsorEmail: "" },
  });
  async function onSubmit(data: Out) {
    const r = await addStudentAction({ ...data, idempotencyKey: `add-${crypto.randomUUID()}` });
    if (r.ok) {
      setMsg({ ok: true, text: `${data.name} added; ${r.data.invitations} invitation${r.data.invitations === 1 ? "" : "s"} queued.` });
      reset({ name: "", email: "", cohortId: data.cohortId, sponsorName: "", sponsorEmail: "" });
      router.refresh();
      return;
    }
    setMsg({ ok: false, text: r.message });
    for (const [f, m] of Object.entries(r.fieldErrors ?? {}))
      if (["name", "email", "cohortId", "sponsorName", "sponsorEmail"].includes(f)) setError(f as keyof In, { message: m[0] });
  }
  const field = (name: keyof In, label: string, type = "text") => (
    <div>
      <label htmlFor={`add-${name}`} className="field-label">
        {label}
      </label>
      <input
        id={`add-${name}`}
        type={type}
        className="field-input"
        aria-invalid={!!errors[name]}
        aria-describedby={`add-${name}-error`}
        {...register(name)}
      />
      {errors[name] && (
        <p id={`add-${name}-error`} className="field-error">
          {String(errors[name]?.message)}
        </p>
      )}
    </div>
  );
  return (
    <form onSubmit={handleSubmit(onSubmit)} className="card space-y-3" aria-labelledby="add-title" noValidate>
      <h2 id="add-title">Add a student</h2>
      {field("name", "Name")}
      {field("email", "E-mail", "email")}
      <ChoiceField
        id="add-cohortId"
        name="cohortId"
        label="Cohort"
        choices={choices}
        defaultValue={first}
        endpoint="/api/directory/cohorts"
        params={{ purpose: "roster" }}
        onChange={(c) => setValue("cohortId", c?.id ?? "")}
        error={errors.cohortId?.message}
      />
      {field("sponsorName", "Sponsor's name (optional)")}
      {field("sponsorEmail", "Sponsor's e-mail (optional)", "email")}
      <p className="text-caption text-ink-soft">New accounts get an invitation to set a password.</p>
      <div aria-live="polite">
        {msg && (
          <p role={msg.ok ? "status" : "alert"} className={msg.ok ? "font-semibold text-solid-800" : "field-error"}>
            {msg.text}
          </p>
        )}
      </div>
      <button type="submit" className="btn-primary" disabled={isSubmitting}>
        Add the student
      </button>
    </form>
  );
}
