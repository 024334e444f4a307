"use client";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import { qualificationSchema } from "@/lib/people/schema";
import { formatDay } from "@/lib/time";
import { saveQualificationAction } from "../../actions";

type In = z.input<typeof qualificationSchema>;
type Out = z.output<typeof qualificationSchema>;

export interface QualificationFormValues {
  qualificationId: string | null;
  certificateKind: string;
  certificateNumber: string;
  ratings: string[];
  checkInstructor: boolean;
  issuedOn: string;
  recencyOn: string;
  recencyMonths: number;
}

/** Adds a qualification (no `current`) or records a change to one, in force from a chosen date. */
export function QualificationForm({
  personId,
  courses,
  courseIds,
  current,
  today,
  idPrefix,
}: {
  personId: string;
  courses: { id: string; code: string; title: string }[];
  courseIds: string[];
  current: QualificationFormValues | null;
  today: string;
  idPrefix: string;
}) {
  const router = useRouter();
  const [message, setMessage] = useState<string | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const [key, setKey] = useState(() => `qual-${crypto.randomUUID()}`);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<In, unknown, Out>({
    resolver: zodResolver(qualificationSchema),
    defaultValues: {
      personId,
      qualificationId: current?.qualificationId ?? null,
      certificateKind: current?.certificateKind ?? "",
      certificateNumber: current?.certificateNumber ?? "",
      ratings: (current?.ratings ?? []).join(", "),
      courseIds,
      checkInstructor: current?.checkInstructor ?? false,
      issuedOn: current?.issuedOn ?? "",
      recencyOn: current?.recencyOn ?? "",
      recencyMonths: current?.recencyMonths ?? 24,
      effectiveFrom: today,
      changeNote: "",
    },
  });
  async function onSubmit(data: Out) {
    setMessage(null);
    setDone(null);
    const r = await saveQualificationAction({ ...data, idempotencyKey: key });
    if (r.ok) {
      setDone(`Saved as version ${r.data.version}, in force from ${formatDay(data.effectiveFrom)}.`);
      setKey(`qual-${crypto.randomUUID()}`);
      router.refresh();
      return;
    }
    setMessage(r.message);
    for (const [field, msgs] of Object.entries(r.fieldErrors ?? {})) {
      if (field in qualificationSchema.shape) setError(field as keyof In, { message: msgs[0] });
    }
  }
  const id = (f: string) => `${idPrefix}-${f}`;
  const field = (f: keyof In, label: string, input: React.ReactNode, wide = false) => (
    <div className={wide ? "sm:col-span-2" : undefined}>
      <label htmlFor={id(f)} className="field-label">
        {label}
      </label>
      {input}
      {errors[f]?.message && (
        <p id={id(`${f}-error`)} className="field-error">
          {String(errors[f]?.message)}
        </p>
      )}
    </div>
  );
  const aria = (f: keyof In) => ({ id: id(f), "aria-invalid": !!errors[f], "aria-describedby": id(`${f}-error`) });
  return (
    <form
      onSubmit={handleSubmit(onSubmit)}
      className="grid gap-4 sm:grid-cols-2"
      noValidate
      aria-label={current ? `Record a change to ${current.certificateNumber}` : "Add a qualification"}
      data-testid={current ? "qualification-change-form" : "qualification-add-form"}
    >
      {field(
        "certificateKind",
        "Kind of certificate",
        <input className="field-input" {...aria("certificateKind")} {...register("certificateKind")} />,
      )}
      {field(
        "certificateNumber",
        "Certificate number",
        <input className="field-input num" {...aria("certificateNumber")} {...register("certificateNumber")} />,
      )}
      {field(
        "ratings",
        "Ratings (separated by commas)",
        <input className="field-input" {...aria("ratings")} {...register("ratings")} />,
        true,
      )}
      {field(
        "courseIds",
        "Courses this instructor may teach (Ctrl or ⌘ to choose several)",
        <select
          multiple
          size={Math.min(6, Math.max(2, courses.length))}
          className="field-input h-auto"
          {...aria("courseIds")}
          {...register("courseIds")}
        >
          {courses.map((c) => (
            <option key={c.id} value={c.id}>
              {c.code} {c.title}
            </option>
          ))}
        </select>,
        true,
      )}
      {field("issuedOn", "Issued on", <input type="date" className="field-input" {...aria("issuedOn")} {...register("issuedOn")} />)}
      {field(
        "recencyOn",
        "Last recency activity on",
        <input type="date" className="field-input" {...aria("recencyOn")} {...register("recencyOn")} />,
      )}
      {field(
        "recencyMonths",
        "Recency lasts (calendar months)",
        <input
          type="number"
          min={1}
          max={120}
          step={1}
          className="field-input num"
          {...aria("recencyMonths")}
          {...register("recencyMonths")}
        />,
      )}
      {field(
        "effectiveFrom",
        "In force from",
        <input type="date" className="field-input" max={today} {...aria("effectiveFrom")} {...register("effectiveFrom")} />,
      )}
      <div className="sm:col-span-2">
        <label className="inline-flex items-center gap-2">
          <input type="checkbox" {...register("checkInstructor")} />
          Designated check instructor (may conduct stage checks)
        </label>
      </div>
      {field(
        "changeNote",
        current ? "What changed and why" : "Note (optional)",
        <textarea rows={2} className="field-input" {...aria("changeNote")} {...register("changeNote")} />,
        true,
      )}
      <div className="sm:col-span-2" aria-live="polite">
        {message && (
          <p role="alert" className="field-error" data-testid="form-message">
            {message}
          </p>
        )}
        {done && (
          <p role="status" data-testid="form-done">
            {done}
          </p>
        )}
      </div>
      <div className="sm:col-span-2">
        <button type="submit" className="btn-primary" disabled={isSubmitting}>
          {isSubmitting ? "Saving…" : current ? "Record the change" : "Add the qualification"}
        </button>
      </div>
    </form>
  );
}
