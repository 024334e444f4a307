"use client";
import { useState } from "react";
import { useRouter } from "next/navigation";
import { useFieldArray, useForm, type Control, type UseFormRegister, type FieldErrors } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import { syllabusRevisionSchema } from "@/lib/syllabus/schema";
import { createSyllabusRevisionAction } from "../actions";

type FormIn = z.input<typeof syllabusRevisionSchema>;
type FormOut = z.output<typeof syllabusRevisionSchema>;

const LEVELS = [
  ["rote", "Rote"],
  ["understanding", "Understanding"],
  ["application", "Application"],
  ["correlation", "Correlation"],
] as const;

function msgAt(errors: FieldErrors<FormIn>, path: (string | number)[]): string | undefined {
  let cur: unknown = errors;
  for (const p of path) cur = (cur as Record<string | number, unknown> | undefined)?.[p];
  return (cur as { message?: string } | undefined)?.message;
}

function Err({ text }: { text?: string }) {
  return text ? (
    <p className="field-error" role="alert">
      {text}
    </p>
  ) : null;
}

function StageItems({
  control,
  register,
  errors,
  stage,
}: {
  control: Control<FormIn, unknown, FormOut>;
  register: UseFormRegister<FormIn>;
  errors: FieldErrors<FormIn>;
  stage: number;
}) {
  const items = useFieldArray({ control, name: `stages.${stage}.items` });
  return (
    <div className="space-y-3">
      <Err text={msgAt(errors, ["stages", stage, "items", "root"]) ?? msgAt(errors, ["stages", stage, "items"])} />
      <ol className="space-y-3">
        {items.fields.map((f, i) => {
          const id = (k: string) => `s${stage}-i${i}-${k}`;
          const e = (k: string) => msgAt(errors, ["stages", stage, "items", i, k]);
          return (
            <li key={f.id} className="rounded-md border border-paper-edge p-3">
              <fieldset className="space-y-3">
                <legend className="font-semibold">Item {i + 1}</legend>
                <div className="grid gap-3 sm:grid-cols-[8rem_1fr_12rem]">
                  <div>
                    <label htmlFor={id("code")} className="field-label">
                      Code
                    </label>
                    <input
                      id={id("code")}
                      className="field-input num"
                      {...register(`stages.${stage}.items.${i}.code`)}
                      aria-invalid={!!e("code")}
                    />
                    <Err text={e("code")} />
                  </div>
                  <div>
                    <label htmlFor={id("title")} className="field-label">
                      Title
                    </label>
                    <input
                      id={id("title")}
                      className="field-input"
                      {...register(`stages.${stage}.items.${i}.title`)}
                      aria-invalid={!!e("title")}
                    />
                    <Err text={e("title")} />
                  </div>
                  <div>
                    <label htmlFor={id("level")} className="field-label">
                      Required level of learning
                    </label>
                    <select id={id("level")} className="field-input" {...register(`stages.${stage}.items.${i}.requiredLevel`)}>
                      {LEVELS.map(([v, l]) => (
                        <option key={v} value={v}>
                          {l}
                        </option>
                      ))}
                    </select>
                  </div>
                </div>
                <div className="grid gap-3 sm:grid-cols-2">
                  <div>
                    <label htmlFor={id("objective")} className="field-label">
                      Objective
                    </label>
                    <textarea
                      id={id("objective")}
                      rows={2}
                      className="field-input py-2"
                      {...register(`stages.${stage}.items.${i}.objective`)}
                      aria-invalid={!!e("objective")}
                    />
                    <Err text={e("objective")} />
                  </div>
                  <div>
                    <label htmlFor={id("standard")} className="field-label">
                      Completion standard
                    </label>
                    <textarea
                      id={id("standard")}
                      rows={2}
                      className="field-input py-2"
                      {...register(`stages.${stage}.items.${i}.completionStandard`)}
                      aria-invalid={!!e("completionStandard")}
                    />
                    <Err text={e("completionStandard")} />
                  </div>
                </div>
                <div className="flex flex-wrap gap-2">
                  <button type="button" className="btn-quiet" disabled={i === 0} onClick={() => items.move(i, i - 1)}>
                    Move up
                    <span className="sr-only">
                      {" "}
                      item {i + 1} of stage {stage + 1}
                    </span>
                  </button>
                  <button type="button" className="btn-quiet" disabled={i === items.fields.length - 1} onClick={() => items.move(i, i + 1)}>
                    Move down
                    <span className="sr-only">
                      {" "}
                      item {i + 1} of stage {stage + 1}
                    </span>
                  </button>
                  <button type="button" className="btn-quiet" disabled={items.fields.length === 1} onClick={() => items.remove(i)}>
                    Remove
                    <span className="sr-only">
                      {" "}
                      item {i + 1} of stage {stage + 1}
                    </span>
                  </button>
                </div>
              </fieldset>
            </li>
          );
        })}
      </ol>
      <button
        type="button"
        className="btn-quiet"
        onClick={() => items.append({ code: "", title: "", objective: "", completionStandard: "", requiredLevel: "understanding" })}
      >
        Add an item
      </button>
    </div>
  );
}

export function RevisionEditor({ initial, nextNumber }: { initial: FormIn; nextNumber: number }) {
  const router = useRouter();
  const [idempotencyKey] = useState(() => crypto.randomUUID());
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    control,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<FormIn, unknown, FormOut>({
    resolver: zodResolver(syllabusRevisionSchema),
    defaultValues: initial,
  });
  const stages = useFieldArray({ control, name: "stages" });
  const onSubmit = handleSubmit(async (data) => {
    setFormError(null);
    const r = await createSyllabusRevisionAction({ ...data, idempotencyKey });
    if (r.ok) {
      router.push(`/syllabus/revisions?course=${data.courseId}`);
      router.refresh();
      return;
    }
    setFormError(r.message);
    for (const [field, messages] of Object.entries(r.fieldErrors ?? {})) setError(field as keyof FormIn, { message: messages[0] });
  });
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-6" aria-label="New syllabus revision">
      {formError && (
        <p role="alert" className="field-error" data-testid="form-error">
          {formError}
        </p>
      )}
      <section className="card grid gap-4 sm:grid-cols-3" aria-label="About this revision">
        <div>
          <label htmlFor="approvedOn" className="field-label">
            Approved on
          </label>
          <input id="approvedOn" type="date" className="field-input num" {...register("approvedOn")} />
          <Err text={msgAt(errors, ["approvedOn"])} />
        </div>
        <div>
          <label htmlFor="effectiveFrom" className="field-label">
            Effective from
          </label>
          <input id="effectiveFrom" type="date" className="field-input num" {...register("effectiveFrom")} />
          <Err text={msgAt(errors, ["effectiveFrom"])} />
        </div>
        <div className="sm:col-span-3">
          <label htmlFor="changeNote" className="field-label">
            What changed in revision {nextNumber}
          </label>
          <input id="changeNote" className="field-input" {...register("changeNote")} aria-invalid={!!msgAt(errors, ["changeNote"])} />
          <Err text={msgAt(errors, ["changeNote"])} />
        </div>
      </section>
      <Err text={msgAt(errors, ["stages", "root"]) ?? msgAt(errors, ["stages"])} />
      {stages.fields.map((f, s) => (
        <section key={f.id} className="card space-y-4" aria-labelledby={`stage-${s}`}>
          <h2 id={`stage-${s}`}>Stage {s + 1}</h2>
          <div className="grid gap-3 sm:grid-cols-[8rem_1fr]">
            <div>
              <label htmlFor={`s${s}-code`} className="field-label">
                Stage code
              </label>
              <input
                id={`s${s}-code`}
                className="field-input num"
                {...register(`stages.${s}.code`)}
                aria-invalid={!!msgAt(errors, ["stages", s, "code"])}
              />
              <Err text={msgAt(errors, ["stages", s, "code"])} />
            </div>
            <div>
              <label htmlFor={`s${s}-title`} className="field-label">
                Stage title
              </label>
              <input
                id={`s${s}-title`}
                className="field-input"
                {...register(`stages.${s}.title`)}
                aria-invalid={!!msgAt(errors, ["stages", s, "title"])}
              />
              <Err text={msgAt(errors, ["stages", s, "title"])} />
            </div>
          </div>
          <StageItems control={control} register={register} errors={errors} stage={s} />
          <div className="flex flex-wrap gap-2 border-t border-paper-edge pt-3">
            <button type="button" className="btn-quiet" disabled={s === 0} onClick={() => stages.move(s, s - 1)}>
              Move stage {s + 1} up
            </button>
            <button type="button" className="btn-quiet" disabled={s === stages.fields.length - 1} onClick={() => stages.move(s, s + 1)}>
              Move stage {s + 1} down
            </button>
            <button type="button" className="btn-quiet" disabled={stages.fields.length === 1} onClick={() => stages.remove(s)}>
              Remove stage {s + 1}
            </button>
          </div>
        </section>
      ))}
      <div className="flex flex-wrap gap-3">
        <button
          type="button"
          className="btn-quiet"
          onClick={() =>
            stages.append({
              code: "",
              title: "",
              items: [{ code: "", title: "", objective: "", completionStandard: "", requiredLevel: "understanding" }],
            })
          }
        >
          Add a stage
        </button>
        <button type="submit" className="btn-primary" disabled={isSubmitting}>
          Save as revision {nextNumber}
        </button>
      </div>
    </form>
  );
}
