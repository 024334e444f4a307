"use client";
import { useState } from "react";
import { useRouter } from "next/navigation";
import { useForm, useWatch } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import { assignmentSchema } from "@/lib/assignments/schema";
import { createAssignmentAction } from "../actions";
import type { AssignmentChoices } from "@/db/access/assignments/choices";
import { MultiSearchPicker, SearchPicker } from "@/components/search-picker";
import type { PickerOption } from "@/lib/directory/picker";

type FormIn = z.input<typeof assignmentSchema>;
type FormOut = z.output<typeof assignmentSchema>;

export function AssignmentForm({
  choices,
  initialBriefingId,
  today,
}: {
  choices: AssignmentChoices;
  initialBriefingId?: string;
  today: string;
}) {
  const router = useRouter();
  const [idempotencyKey, setKey] = useState(() => crypto.randomUUID());
  const [status, setStatus] = useState<{ ok: boolean; text: string } | null>(null);
  const [target, setTarget] = useState<"cohort" | "students">("cohort");
  const firstCohort = choices.cohorts.kind === "list" ? (choices.cohorts.rows[0]?.id ?? "") : "";
  // the students chosen through the search picker (a large school)
  const [picked, setPicked] = useState<PickerOption[]>([]);
  // a new round empties the search pickers after an assignment is made
  const [round, setRound] = useState(0);
  const pickStudents = (next: PickerOption[]) => {
    setPicked(next);
    setValue(
      "studentIds",
      next.map((p) => p.id),
      { shouldDirty: true },
    );
  };
  const {
    register,
    handleSubmit,
    control,
    setError,
    setValue,
    reset,
    formState: { errors, isSubmitting },
  } = useForm<FormIn, unknown, FormOut>({
    resolver: zodResolver(assignmentSchema),
    defaultValues: {
      kind: "briefing",
      briefingId: initialBriefingId ?? "",
      demoId: "",
      cohortId: firstCohort,
      studentIds: [],
      dueOn: "",
      note: "",
    },
  });
  const kind = useWatch({ control, name: "kind" });

  const onSubmit = handleSubmit(async (data) => {
    setStatus(null);
    const result = await createAssignmentAction({ ...data, idempotencyKey });
    if (result.ok) {
      setStatus({ ok: true, text: `Assigned. ${result.data.mailed} student${result.data.mailed === 1 ? "" : "s"} will get an e-mail.` });
      setKey(crypto.randomUUID());
      reset();
      setPicked([]);
      setRound((r) => r + 1);
      router.refresh();
      return;
    }
    setStatus({ ok: false, text: result.message });
    for (const [field, messages] of Object.entries(result.fieldErrors ?? {})) setError(field as keyof FormIn, { message: messages[0] });
  });
  const msg = (k: keyof FormIn) => errors[k]?.message as string | undefined;

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label="New assignment">
      <fieldset className="flex flex-wrap gap-4">
        <legend className="field-label">Assign</legend>
        <label className="flex min-h-touch items-center gap-2">
          <input type="radio" value="briefing" className="size-5" {...register("kind")} /> A briefing
        </label>
        <label className="flex min-h-touch items-center gap-2">
          <input type="radio" value="demo" className="size-5" {...register("kind")} /> A demo
        </label>
      </fieldset>
      {kind === "briefing" ? (
        <div>
          <label htmlFor="briefingId" className="field-label">
            Briefing
          </label>
          <select
            id="briefingId"
            className="field-input"
            {...register("briefingId")}
            aria-invalid={!!msg("briefingId")}
            aria-describedby="e-briefing"
          >
            <option value="">Choose a briefing</option>
            {choices.briefings.map((b) => (
              <option key={b.id} value={b.id}>
                {b.title}
              </option>
            ))}
          </select>
          {msg("briefingId") && (
            <p id="e-briefing" className="field-error" role="alert">
              {msg("briefingId")}
            </p>
          )}
        </div>
      ) : (
        <div>
          <label htmlFor="demoId" className="field-label">
            Demo
          </label>
          <select id="demoId" className="field-input" {...register("demoId")} aria-invalid={!!msg("demoId")} aria-describedby="e-demo">
            <option value="">Choose a demo</option>
            {choices.demos.map((d) => (
              <option key={d.id} value={d.id}>
                {d.name}
              </option>
            ))}
          </select>
          {msg("demoId") && (
            <p id="e-demo" className="field-error" role="alert">
              {msg("demoId")}
            </p>
          )}
        </div>
      )}
      <fieldset className="flex flex-wrap gap-4">
        <legend className="field-label">To</legend>
        <label className="flex min-h-touch items-center gap-2">
          <input
            type="radio"
            name="target"
            className="size-5"
            checked={target === "cohort"}
            onChange={() => {
              setTarget("cohort");
              setValue("studentIds", []);
              setValue("cohortId", firstCohort);
            }}
          />{" "}
          A cohort
        </label>
        <label className="flex min-h-touch items-center gap-2">
          <input
            type="radio"
            name="target"
            className="size-5"
            checked={target === "students"}
            onChange={() => {
              setTarget("students");
              setValue("cohortId", "");
            }}
          />{" "}
          Chosen students
        </label>
      </fieldset>
      {target === "cohort" && choices.cohorts.kind === "search" ? (
        <SearchPicker
          key={round}
          id="cohortId"
          name="cohortId"
          label="Cohort"
          endpoint="/api/directory/cohorts"
          params={{ purpose: "assignments" }}
          error={msg("cohortId") ?? null}
          onChange={(c) => setValue("cohortId", c?.id ?? "", { shouldDirty: true })}
        />
      ) : target === "cohort" && choices.cohorts.kind === "list" ? (
        <div>
          <label htmlFor="cohortId" className="field-label">
            Cohort
          </label>
          <select
            id="cohortId"
            className="field-input"
            {...register("cohortId")}
            aria-invalid={!!msg("cohortId")}
            aria-describedby="e-cohort"
          >
            {choices.cohorts.rows.map((c) => (
              <option key={c.id} value={c.id}>
                {c.name}
              </option>
            ))}
          </select>
          {msg("cohortId") && (
            <p id="e-cohort" className="field-error" role="alert">
              {msg("cohortId")}
            </p>
          )}
        </div>
      ) : choices.students.kind === "search" ? (
        <MultiSearchPicker
          key={round}
          id="studentIds"
          name="studentIdsChosen"
          label="Students (choose one at a time)"
          endpoint="/api/directory/students"
          params={{ purpose: "assignments" }}
          error={msg("studentIds") ?? msg("cohortId") ?? null}
          value={picked}
          onChange={pickStudents}
        />
      ) : (
        <fieldset>
          <legend className="field-label">Students</legend>
          <div className="mt-1 grid max-h-64 gap-1 overflow-y-auto sm:grid-cols-2">
            {choices.students.rows.map((s) => (
              <label key={s.id} className="flex min-h-touch items-center gap-2">
                <input type="checkbox" value={s.id} className="size-5" {...register("studentIds")} /> {s.name}{" "}
                <span className="text-caption text-ink-soft">· {s.detail}</span>
              </label>
            ))}
          </div>
          {(msg("studentIds") || msg("cohortId")) && (
            <p className="field-error" role="alert">
              {msg("studentIds") ?? msg("cohortId")}
            </p>
          )}
        </fieldset>
      )}
      <div className="grid gap-4 sm:grid-cols-[12rem_1fr]">
        <div>
          <label htmlFor="dueOn" className="field-label">
            Due on
          </label>
          <input
            id="dueOn"
            type="date"
            min={today}
            className="field-input num"
            {...register("dueOn")}
            aria-invalid={!!msg("dueOn")}
            aria-describedby="e-due"
          />
          {msg("dueOn") && (
            <p id="e-due" className="field-error" role="alert">
              {msg("dueOn")}
            </p>
          )}
        </div>
        <div>
          <label htmlFor="note" className="field-label">
            Note to students (optional)
          </label>
          <input id="note" className="field-input" {...register("note")} />
        </div>
      </div>
      <div className="flex flex-wrap items-center gap-3">
        <button type="submit" className="btn-primary" disabled={isSubmitting}>
          Assign
        </button>
        <p
          role="status"
          aria-live="polite"
          className={status?.ok ? "text-caption text-solid-800" : "field-error"}
          data-testid="assign-status"
        >
          {status?.text}
        </p>
      </div>
    </form>
  );
}
