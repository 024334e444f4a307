"use client";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import { withdrawFromCohortSchema } from "@/lib/completion/schema";
import { withdrawFromCohortAction } from "../../actions";

type In = z.input<typeof withdrawFromCohortSchema>;
type Out = z.output<typeof withdrawFromCohortSchema>;
const FIELDS = ["leftOn", "reason"] as const;

/** The chief withdraws a student from their cohort on a date, with a reason; the student stays on the course. */
export function WithdrawCohortForm({ studentId, cohortName, today }: { studentId: string; cohortName: string; today: string }) {
  const router = useRouter();
  const [idempotencyKey] = useState(() => crypto.randomUUID());
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<In, unknown, Out>({
    resolver: zodResolver(withdrawFromCohortSchema),
    defaultValues: { studentId, leftOn: today, reason: "" },
  });
  async function onSubmit(data: Out) {
    setMessage(null);
    const r = await withdrawFromCohortAction({ ...data, idempotencyKey });
    if (r.ok) {
      setMessage({ ok: true, text: `Left ${r.data.cohortName}; the student stays on the course.` });
      router.refresh();
      return;
    }
    const beside = Object.entries(r.fieldErrors ?? {}).filter(([f]) => (FIELDS as readonly string[]).includes(f));
    for (const [f, m] of beside) setError(f as (typeof FIELDS)[number], { message: m[0] });
    setMessage({ ok: false, text: beside.length ? "Not withdrawn: see the message above." : r.message });
  }
  return (
    <form onSubmit={handleSubmit(onSubmit)} className="space-y-3" aria-label={`Withdraw from ${cohortName}`} noValidate>
      <div>
        <label htmlFor="wc-leftOn" className="field-label">
          Leaves {cohortName} on
        </label>
        <input
          id="wc-leftOn"
          type="date"
          max={today}
          className="field-input"
          aria-invalid={!!errors.leftOn}
          aria-describedby={errors.leftOn ? "wc-leftOn-error" : undefined}
          {...register("leftOn")}
        />
        {errors.leftOn && (
          <p id="wc-leftOn-error" className="field-error">
            {errors.leftOn.message}
          </p>
        )}
      </div>
      <div>
        <label htmlFor="wc-reason" className="field-label">
          Reason
        </label>
        <textarea
          id="wc-reason"
          rows={2}
          className="field-input"
          aria-invalid={!!errors.reason}
          aria-describedby={errors.reason ? "wc-reason-error" : undefined}
          {...register("reason")}
        />
        {errors.reason && (
          <p id="wc-reason-error" className="field-error">
            {errors.reason.message}
          </p>
        )}
      </div>
      <div aria-live="polite">
        {message && (
          <p role={message.ok ? "status" : "alert"} className={message.ok ? "font-semibold text-solid-800" : "field-error"}>
            {message.text}
          </p>
        )}
      </div>
      <button type="submit" className="btn-quiet" disabled={isSubmitting}>
        Withdraw from the cohort
      </button>
    </form>
  );
}
