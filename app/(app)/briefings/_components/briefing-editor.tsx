"use client";
import { useMemo, useState } from "react";
import { useRouter } from "next/navigation";
import { useFieldArray, useForm, useWatch } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import { briefingSchema } from "@/lib/briefings/schema";
import { createBriefingAction, reviseBriefingAction } from "../actions";
import type { EditorChoices } from "@/db/access/briefings/editor-choices";

type FormIn = z.input<typeof briefingSchema>;
type FormOut = z.output<typeof briefingSchema>;

export interface BriefingEditorProps {
  briefingId?: string;
  nextNumber: number;
  initial: FormIn;
  choices: EditorChoices;
  handouts: { id: string; fileName: string }[];
}

function FieldError({ id, message }: { id: string; message?: string }) {
  return message ? (
    <p id={id} className="field-error" role="alert">
      {message}
    </p>
  ) : null;
}

export function BriefingEditor({ briefingId, nextNumber, initial, choices, handouts }: BriefingEditorProps) {
  const router = useRouter();
  const [idempotencyKey] = useState(() => crypto.randomUUID());
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    control,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<FormIn, unknown, FormOut>({ resolver: zodResolver(briefingSchema), defaultValues: initial });
  const elements = useFieldArray({ control, name: "elements" });
  const courseId = useWatch({ control, name: "courseId" });
  const syllabusRevisionId = useWatch({ control, name: "syllabusRevisionId" });
  const minutes = (useWatch({ control, name: "elements" }) ?? []).reduce((sum, e) => sum + (Number(e?.minutes) || 0), 0);
  const revisions = useMemo(() => choices.syllabusRevisions.filter((r) => r.courseId === courseId), [choices, courseId]);
  const items = revisions.find((r) => r.id === syllabusRevisionId)?.items ?? [];

  const onSubmit = handleSubmit(async (data) => {
    setFormError(null);
    const result = briefingId
      ? await reviseBriefingAction({ ...data, briefingId, idempotencyKey })
      : await createBriefingAction({ ...data, idempotencyKey });
    if (result.ok) {
      router.push(`/briefings/${result.data.briefingId}`);
      router.refresh();
      return;
    }
    setFormError(result.message);
    for (const [field, messages] of Object.entries(result.fieldErrors ?? {})) {
      setError(field as keyof FormIn, { message: messages[0] });
    }
  });

  const err = (path: string): string | undefined => {
    const parts = path.split(".");
    let cur: unknown = errors;
    for (const p of parts) cur = (cur as Record<string, unknown> | undefined)?.[p];
    return (cur as { message?: string } | undefined)?.message;
  };
  const aria = (path: string, id: string) => (err(path) ? { "aria-invalid": true, "aria-describedby": id } : {});

  return (
    <form onSubmit={onSubmit} className="space-y-6" noValidate aria-label={briefingId ? "Edit briefing" : "New briefing"}>
      {formError && (
        <p role="alert" className="field-error" data-testid="form-error">
          {formError}
        </p>
      )}
      <section className="card space-y-4" aria-labelledby="sec-what">
        <h2 id="sec-what">What the briefing teaches</h2>
        <div className="grid gap-4 sm:grid-cols-2">
          <div>
            <label htmlFor="courseId" className="field-label">
              Course
            </label>
            <select id="courseId" className="field-input" disabled={!!briefingId} {...register("courseId")}>
              {choices.courses.map((c) => (
                <option key={c.id} value={c.id}>
                  {c.code} · {c.title}
                </option>
              ))}
            </select>
          </div>
          <div>
            <label htmlFor="syllabusRevisionId" className="field-label">
              Syllabus revision
            </label>
            <select
              id="syllabusRevisionId"
              className="field-input"
              {...register("syllabusRevisionId")}
              {...aria("syllabusRevisionId", "e-syl")}
            >
              {revisions.map((r) => (
                <option key={r.id} value={r.id}>
                  Revision {r.number}
                </option>
              ))}
            </select>
            <FieldError id="e-syl" message={err("syllabusRevisionId")} />
          </div>
        </div>
        <div>
          <label htmlFor="title" className="field-label">
            Title
          </label>
          <input id="title" className="field-input" {...register("title")} {...aria("title", "e-title")} />
          <FieldError id="e-title" message={err("title")} />
        </div>
        <div>
          <label htmlFor="objective" className="field-label">
            Objective
          </label>
          <textarea id="objective" rows={3} className="field-input py-2" {...register("objective")} {...aria("objective", "e-objective")} />
          <FieldError id="e-objective" message={err("objective")} />
        </div>
        <fieldset>
          <legend className="field-label">Syllabus items covered</legend>
          <div className="mt-1 grid gap-1 sm:grid-cols-2">
            {items.map((i) => (
              <label key={i.id} className="flex min-h-touch items-center gap-2">
                <input type="checkbox" value={i.id} className="size-5" {...register("syllabusItemIds")} />
                <span>
                  <span className="num font-semibold">{i.code}</span> {i.title}
                </span>
              </label>
            ))}
          </div>
          <FieldError id="e-items" message={err("syllabusItemIds")} />
        </fieldset>
      </section>

      <section className="card space-y-4" aria-labelledby="sec-elements">
        <div className="flex flex-wrap items-baseline justify-between gap-2">
          <h2 id="sec-elements">Elements, in order</h2>
          <p className="text-caption text-ink-soft" aria-live="polite">
            Total{" "}
            <span className="num" data-testid="total-minutes">
              {minutes}
            </span>{" "}
            min
          </p>
        </div>
        <FieldError id="e-elements" message={err("elements") ?? err("elements.root")} />
        <ol className="space-y-4">
          {elements.fields.map((f, idx) => (
            <li key={f.id} className="rounded-md border border-paper-edge p-3">
              <fieldset className="space-y-3">
                <legend className="font-semibold">Element {idx + 1}</legend>
                <div className="grid gap-3 sm:grid-cols-[1fr_8rem]">
                  <div>
                    <label htmlFor={`el-${idx}-title`} className="field-label">
                      Element title
                    </label>
                    <input
                      id={`el-${idx}-title`}
                      className="field-input"
                      {...register(`elements.${idx}.title`)}
                      {...aria(`elements.${idx}.title`, `e-el-${idx}-title`)}
                    />
                    <FieldError id={`e-el-${idx}-title`} message={err(`elements.${idx}.title`)} />
                  </div>
                  <div>
                    <label htmlFor={`el-${idx}-minutes`} className="field-label">
                      Minutes
                    </label>
                    <input
                      id={`el-${idx}-minutes`}
                      type="number"
                      inputMode="numeric"
                      min={1}
                      max={480}
                      className="field-input num"
                      {...register(`elements.${idx}.minutes`)}
                      {...aria(`elements.${idx}.minutes`, `e-el-${idx}-minutes`)}
                    />
                    <FieldError id={`e-el-${idx}-minutes`} message={err(`elements.${idx}.minutes`)} />
                  </div>
                </div>
                <div className="grid gap-3 sm:grid-cols-2">
                  <div>
                    <label htmlFor={`el-${idx}-ia`} className="field-label">
                      Instructor&apos;s actions
                    </label>
                    <textarea
                      id={`el-${idx}-ia`}
                      rows={3}
                      className="field-input py-2"
                      {...register(`elements.${idx}.instructorActions`)}
                      {...aria(`elements.${idx}.instructorActions`, `e-el-${idx}-ia`)}
                    />
                    <FieldError id={`e-el-${idx}-ia`} message={err(`elements.${idx}.instructorActions`)} />
                  </div>
                  <div>
                    <label htmlFor={`el-${idx}-sa`} className="field-label">
                      Students&apos; actions
                    </label>
                    <textarea
                      id={`el-${idx}-sa`}
                      rows={3}
                      className="field-input py-2"
                      {...register(`elements.${idx}.studentActions`)}
                      {...aria(`elements.${idx}.studentActions`, `e-el-${idx}-sa`)}
                    />
                    <FieldError id={`e-el-${idx}-sa`} message={err(`elements.${idx}.studentActions`)} />
                  </div>
                </div>
                <div className="flex flex-wrap gap-2">
                  <button type="button" className="btn-quiet" disabled={idx === 0} onClick={() => elements.move(idx, idx - 1)}>
                    Move up<span className="sr-only"> element {idx + 1}</span>
                  </button>
                  <button
                    type="button"
                    className="btn-quiet"
                    disabled={idx === elements.fields.length - 1}
                    onClick={() => elements.move(idx, idx + 1)}
                  >
                    Move down<span className="sr-only"> element {idx + 1}</span>
                  </button>
                  <button type="button" className="btn-quiet" disabled={elements.fields.length === 1} onClick={() => elements.remove(idx)}>
                    Remove<span className="sr-only"> element {idx + 1}</span>
                  </button>
                </div>
              </fieldset>
            </li>
          ))}
        </ol>
        <button
          type="button"
          className="btn-quiet"
          onClick={() => elements.append({ title: "", instructorActions: "", studentActions: "", minutes: 10 })}
        >
          Add an element
        </button>
      </section>

      <section className="card space-y-4" aria-labelledby="sec-material">
        <h2 id="sec-material">Material and standard</h2>
        <div>
          <label htmlFor="equipment" className="field-label">
            Equipment
          </label>
          <textarea id="equipment" rows={2} className="field-input py-2" {...register("equipment")} />
        </div>
        <fieldset>
          <legend className="field-label">Demos used</legend>
          {choices.demos.length === 0 ? (
            <p className="text-caption text-ink-soft">No demos saved in Curve Lab yet.</p>
          ) : (
            <div className="mt-1 grid gap-1 sm:grid-cols-2">
              {choices.demos.map((d) => (
                <label key={d.demoRevisionId} className="flex min-h-touch items-center gap-2">
                  <input type="checkbox" value={d.demoRevisionId} className="size-5" {...register("demoRevisionIds")} />
                  <span>
                    {d.name}{" "}
                    <span className="text-caption text-ink-soft">
                      · revision {d.revisionNumber}
                      {d.current ? "" : " (earlier)"}
                    </span>
                  </span>
                </label>
              ))}
            </div>
          )}
          <FieldError id="e-demos" message={err("demoRevisionIds")} />
        </fieldset>
        {handouts.length > 0 && (
          <fieldset>
            <legend className="field-label">Handouts kept</legend>
            <div className="mt-1 grid gap-1">
              {handouts.map((h) => (
                <label key={h.id} className="flex min-h-touch items-center gap-2">
                  <input type="checkbox" value={h.id} className="size-5" {...register("handoutIds")} />
                  <span className="break-all">{h.fileName}</span>
                </label>
              ))}
            </div>
          </fieldset>
        )}
        <div>
          <label htmlFor="completionStandard" className="field-label">
            Completion standard
          </label>
          <textarea
            id="completionStandard"
            rows={3}
            className="field-input py-2"
            {...register("completionStandard")}
            {...aria("completionStandard", "e-cs")}
          />
          <FieldError id="e-cs" message={err("completionStandard")} />
        </div>
        <div>
          <label htmlFor="changeNote" className="field-label">
            What changed (kept with revision {nextNumber})
          </label>
          <input id="changeNote" className="field-input" {...register("changeNote")} />
        </div>
      </section>
      <div className="flex flex-wrap items-center gap-3">
        <button type="submit" className="btn-primary" disabled={isSubmitting}>
          {briefingId ? `Save as revision ${nextNumber}` : "Save briefing"}
        </button>
        <p className="text-caption text-ink-soft">Handouts are added from the briefing&apos;s page once it is saved.</p>
      </div>
    </form>
  );
}
