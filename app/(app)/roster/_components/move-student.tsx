"use client";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import { moveStudentSchema } from "@/lib/roster/schema";
import { ChoiceField } from "@/components/search-picker";
import type { PickerChoices } from "@/lib/directory/picker";
import { moveStudentAction } from "../actions";

type In = z.input<typeof moveStudentSchema>;
type Out = z.output<typeof moveStudentSchema>;

export function MoveStudent({
  studentId,
  studentName,
  currentCohortId,
  choices,
  today,
}: {
  studentId: string;
  studentName: string;
  currentCohortId: string;
  /** the open cohorts to move to: listed while few, else searched (the current one is refused by the server) */
  choices: PickerChoices;
  today: string;
}) {
  const router = useRouter();
  const [open, setOpen] = useState(false);
  const [msg, setMsg] = useState<string | null>(null);
  const listed = choices.kind === "list" ? { kind: "list" as const, rows: choices.rows.filter((c) => c.id !== currentCohortId) } : choices;
  const others = listed.kind === "list" ? listed.rows : null;
  const {
    register,
    handleSubmit,
    setValue,
    formState: { errors, isSubmitting },
  } = useForm<In, unknown, Out>({
    resolver: zodResolver(moveStudentSchema),
    defaultValues: { studentId, toCohortId: others?.[0]?.id ?? "", onDate: today },
  });
  if (others && others.length === 0) return <span className="text-caption text-ink-faint">No other cohort</span>;
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
      <ChoiceField
        id={`mv-c-${studentId}`}
        name="toCohortId"
        label="To cohort"
        choices={listed}
        defaultValue={others?.[0]?.id}
        endpoint="/api/directory/cohorts"
        params={{ purpose: "roster" }}
        onChange={(c) => setValue("toCohortId", c?.id ?? "")}
        error={errors.toCohortId?.message}
      />
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
