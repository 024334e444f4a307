"use client";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import { moveStudentSchema } from "@/lib/roster/schema";
import { moveStudentAction } from "../actions";

type In = z.input<typeof moveStudentSchema>;
type Out = z.output<typeof moveStudentSchema>;

export function MoveStudent({
  studentId,
  studentName,
  currentCohortId,
  cohorts,
  today,
}: {
  studentId: string;
  studentName: string;
  currentCohortId: string;
  cohorts: { id: string; name: string }[];
  today: string;
}) {
  const router = useRouter();
  const [open, setOpen] = useState(false);
  const [msg, setMsg] = useState<string | null>(null);
  const others = cohorts.filter((c) => c.id !== currentCohortId);
  const {
    register,
    handleSubmit,
    formState: { errors, isSubmitting },
  } = useForm<In, unknown, Out>({
    resolver: zodResolver(moveStudentSchema),
    defaultValues: { studentId, toCohortId: others[0]?.id ?? "", onDate: today },
  });
  if (others.length === 0) return <span className="text-caption text-ink-faint">No other cohort</span>;
  if (!open)
    return (
      <button type="button" className="btn-quiet" onClick={() => setOpen(true)} aria-label={`Move ${studentName}`}>
        Move
      </button>
    );
  async function onSubmit(data: Out) {
    const r = await moveStudentAction(data);
    if (r.ok) {
      setOpen(false);
      router.refresh();
    } else setMsg(r.message);
  }
  return (
    <form onSubmit={handleSubmit(onSubmit)} className="min-w-52 space-y-2" noValidate aria-label={`Move ${studentName}`}>
      <div>
        <label htmlFor={`mv-c-${studentId}`} className="field-label">
          To cohort
        </label>
        <select id={`mv-c-${studentId}`} className="field-input" {...register("toCohortId")}>
          {others.map((c) => (
            <option key={c.id} value={c.id}>
              {c.name}
            </option>
          ))}
        </select>
      </div>
      <div>
        <label htmlFor={`mv-d-${studentId}`} className="field-label">
          From date
        </label>
        <input id={`mv-d-${studentId}`} type="date" className="field-input" {...register("onDate")} />
        {errors.onDate && <p className="field-error">{errors.onDate.message}</p>}
      </div>
      {msg && (
        <p role="alert" className="field-error">
          {msg}
        </p>
      )}
      <button type="submit" className="btn-primary" disabled={isSubmitting}>
        Move
      </button>
    </form>
  );
}
