"use client";
import { useState, useTransition } from "react";
import { useRouter } from "next/navigation";
import { useFieldArray, useForm, useWatch, type Control } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { amendCheckAction, recordCheckAction } from "../../actions";
import {
  LEVELS,
  LEVEL_LABEL,
  QUESTION_OUTCOMES,
  OUTCOME_LABEL,
  CHECK_OUTCOME_LABEL,
  evaluateCheck,
  DEFAULT_OUTCOME_RULE,
  type LevelOfLearning,
} from "@/lib/records/outcome";
import {
  ANSWER_MODES,
  ANSWER_MODE_LABEL,
  QUESTION_INPUTS_NEEDED,
  QUESTION_INPUT_LABEL,
  QUESTION_KINDS,
  QUESTION_KIND_LABEL,
  QuestionInputError,
  RULE_OF_THUMB,
  generateQuestion,
  figureWithinTolerance,
  toleranceText,
  type AircraftSnapshot,
  type QuestionKind,
} from "@/lib/records/questions";
import {
  checkFormSchema,
  checkFormToInput,
  generatorInputsOf,
  ELEMENT_KINDS,
  recordCheckSchema,
  type CheckFormQuestion,
  type CheckFormValues,
} from "@/lib/records/schema";

interface Item {
  id: string;
  code: string;
  title: string;
  requiredLevel: LevelOfLearning;
}

type FormValues = CheckFormValues;
type QuestionValues = CheckFormQuestion;
/** A question as the form opens it: item, outcome and element kind not chosen yet. */
type BlankQuestion = Omit<QuestionValues, "outcome" | "required"> & {
  outcome: QuestionValues["outcome"] | undefined;
  required: QuestionValues["required"] | undefined;
};

function localNow(): string {
  const d = new Date();
  d.setMinutes(d.getMinutes() - d.getTimezoneOffset());
  return d.toISOString().slice(0, 16);
}
// the inputs of each kind and the boxes' labels (with units) come from lib/records/questions.ts, whose refusals use the same words
const NEEDS: Record<QuestionKind, readonly ("massKg" | "altitudeFt" | "speedKt" | "heightFt")[]> = QUESTION_INPUTS_NEEDED;
const INPUT_LABEL = QUESTION_INPUT_LABEL;

// Nothing starts as a pass: the item (when the check covers more than one), the outcome and
// whether the element is required are chosen by the examiner for every question.
function blankQuestion(itemId: string, aircraftKey: string): BlankQuestion {
  return {
    syllabusItemId: itemId,
    mode: "written",
    questionText: "",
    kind: "vmd",
    aircraftKey,
    massKg: "",
    altitudeFt: "0",
    speedKt: "",
    heightFt: "",
    answerMode: "exact",
    studentFigure: "",
    answerSummary: "",
    outcome: undefined,
    required: undefined,
    prompted: false,
    correctiveGiven: false,
  };
}

export function CheckForm({
  studentId,
  items,
  aircraft,
  sessions,
  amends,
}: {
  studentId: string;
  items: Item[];
  aircraft: AircraftSnapshot[];
  sessions: { id: string; label: string }[];
  /** amending this check: the form records the corrected check, with a reason and the password */
  amends?: { checkId: string };
}) {
  const [amendReason, setAmendReason] = useState("");
  /** prefix of element ids: an amendment form may be open beside the new-check form */
  const px = amends ? `amend-${amends.checkId}-` : "";
  const [password, setPassword] = useState("");
  const router = useRouter();
  const [pending, start] = useTransition();
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const [idempotencyKey, setKey] = useState(() => crypto.randomUUID());
  const firstAircraft = aircraft[0] ? `${aircraft[0].source.kind}:${aircraft[0].source.id}` : "";
  const form = useForm<FormValues>({
    resolver: zodResolver(checkFormSchema),
    defaultValues: {
      itemIds: [],
      levelShown: undefined,
      durationMinutes: "10",
      occurredAt: localNow(),
      sessionId: "",
      remarks: "",
      questions: [blankQuestion("", firstAircraft) as QuestionValues],
    },
  });
  const { register, control, handleSubmit, formState, setError, reset } = form;
  const questions = useFieldArray({ control, name: "questions" });
  const chosen = useWatch({ control, name: "itemIds" }) ?? [];
  const level = useWatch({ control, name: "levelShown" });
  const qs = useWatch({ control, name: "questions" }) ?? [];
  const chosenItems = items.filter((i) => chosen.includes(i.id));
  // the rule speaks only once everything it reads has been chosen
  const undecided = [
    ...(chosenItems.length === 0 ? ["the items"] : []),
    ...(level ? [] : ["the level of learning"]),
    ...(qs.some((q) => !q.syllabusItemId) ? ["each question's item"] : []),
    ...(qs.some((q) => !q.outcome) ? ["each question's outcome"] : []),
    ...(qs.some((q) => !q.required) ? ["whether each question is on a required element"] : []),
  ];
  const preview =
    undecided.length === 0
      ? evaluateCheck({
          levelShown: level,
          items: chosenItems.map((i) => ({ id: i.id, code: i.code, requiredLevel: i.requiredLevel })),
          questions: qs.map((q) => ({ syllabusItemId: q.syllabusItemId, outcome: q.outcome, required: q.required === "required" })),
        })
      : null;

  const onSubmit = (v: FormValues) =>
    start(async () => {
      setMessage(null);
      const input = checkFormToInput(studentId, v);
      // the server's schema, checked here first: its messages land on the same fields
      const checked = recordCheckSchema.safeParse(input);
      if (!checked.success) {
        const issues = checked.error.issues;
        for (const issue of issues) setError(issue.path.map(String).join(".") as never, { message: issue.message });
        setMessage({ ok: false, text: `${issues[0]?.path.map(String).join(".") || "form"}: ${issues[0]?.message ?? "invalid input"}` });
        return;
      }
      const payload = { idempotencyKey, ...input };
      const r = amends
        ? await amendCheckAction({ ...payload, amends: { checkId: amends.checkId, reason: amendReason }, password })
        : await recordCheckAction(payload);
      if (r.ok) {
        setMessage({
          ok: true,
          text: `${amends ? "Amendment" : "Check"} recorded: ${CHECK_OUTCOME_LABEL[r.data.outcome]}.${r.data.notYetMailed ? " The student was sent a note about the Not yet items." : ""}${r.data.makeupItemsClosed.length ? ` It closed ${r.data.makeupItemsClosed.length} make-up item${r.data.makeupItemsClosed.length === 1 ? "" : "s"}.` : ""}`,
        });
        setKey(crypto.randomUUID());
        reset({
          itemIds: [],
          levelShown: undefined,
          durationMinutes: "10",
          occurredAt: localNow(),
          sessionId: v.sessionId,
          remarks: "",
          questions: [blankQuestion("", firstAircraft) as QuestionValues],
        });
        router.refresh();
      } else {
        for (const [field, msgs] of Object.entries(r.fieldErrors ?? {})) setError(field as never, { message: msgs[0] });
        setMessage({ ok: false, text: r.message });
      }
    });

  const err = (path: string) => {
    const parts = path.split(".");
    let e: unknown = formState.errors;
    for (const p of parts) e = (e as Record<string, unknown> | undefined)?.[p];
    const m = (e as { message?: string } | undefined)?.message;
    return m ? (
      <p className="field-error" role="alert">
        {m}
      </p>
    ) : null;
  };

  return (
    <form
      onSubmit={handleSubmit(onSubmit)}
      className="mt-3 space-y-5"
      noValidate
      aria-label={amends ? "Amend the oral check" : "Oral check"}
    >
      <fieldset>
        <legend className="field-label">Syllabus items checked</legend>
        <div className="mt-1 flex flex-wrap gap-2">
          {items.map((i) => (
            <label
              key={i.id}
              className="inline-flex min-h-touch cursor-pointer items-center gap-2 rounded-md border border-paper-edge bg-white px-3 has-[:checked]:border-wing-600 has-[:checked]:bg-wing-50"
            >
              <input type="checkbox" value={i.id} {...register("itemIds")} className="h-5 w-5" />
              <span>
                <span className="num font-semibold">{i.code}</span> {i.title}
              </span>
            </label>
          ))}
        </div>
        {err("itemIds")}
      </fieldset>

      <fieldset>
        <legend className="field-label">Level of learning shown</legend>
        <div className="mt-1 grid grid-cols-2 gap-2 sm:grid-cols-4">
          {LEVELS.map((l) => (
            <label
              key={l}
              className="inline-flex min-h-touch cursor-pointer items-center justify-center gap-2 rounded-md border border-paper-edge bg-white px-3 has-[:checked]:border-wing-600 has-[:checked]:bg-wing-50"
            >
              <input type="radio" value={l} {...register("levelShown")} className="h-5 w-5" />
              {LEVEL_LABEL[l]}
            </label>
          ))}
        </div>
        {err("levelShown")}
      </fieldset>

      <div className="grid gap-3 sm:grid-cols-3">
        <div>
          <label htmlFor={`${px}sessionId`} className="field-label">
            During or after a session (optional)
          </label>
          <select id={`${px}sessionId`} {...register("sessionId")} className="field-input">
            <option value="">No session</option>
            {sessions.map((x) => (
              <option key={x.id} value={x.id}>
                {x.label}
              </option>
            ))}
          </select>
        </div>
        <div>
          <label htmlFor={`${px}occurredAt`} className="field-label">
            When it happened
          </label>
          <input id={`${px}occurredAt`} type="datetime-local" {...register("occurredAt")} className="field-input" />
          {err("occurredAt")}
        </div>
        <div>
          <label htmlFor={`${px}durationMinutes`} className="field-label">
            Duration (min)
          </label>
          <input id={`${px}durationMinutes`} inputMode="numeric" {...register("durationMinutes")} className="field-input num" />
          {err("durationMinutes")}
        </div>
      </div>

      <div className="space-y-4">
        <h3 className="font-semibold">Questions</h3>
        {questions.fields.map((f, idx) => (
          <QuestionFields
            key={f.id}
            idx={idx}
            px={px}
            control={control}
            register={register}
            items={chosenItems.length ? chosenItems : items}
            aircraft={aircraft}
            err={err}
            onRemove={questions.fields.length > 1 ? () => questions.remove(idx) : undefined}
          />
        ))}
        {err("questions")}
        <button
          type="button"
          className="btn-quiet"
          onClick={() => questions.append(blankQuestion(chosen.length === 1 ? chosen[0]! : "", firstAircraft) as QuestionValues)}
        >
          Add a question
        </button>
      </div>

      <div>
        <label htmlFor={`${px}remarks`} className="field-label">
          Remarks (internal: never shown to the student or sponsors)
        </label>
        <textarea id={`${px}remarks`} rows={2} {...register("remarks")} className="field-input py-2" />
      </div>

      <div className="rounded-md border border-paper-edge bg-paper p-3" aria-live="polite" data-testid="outcome-preview">
        {preview ? (
          <>
            <p className="font-semibold" data-testid="outcome-verdict">
              Outcome by the rule: {CHECK_OUTCOME_LABEL[preview.outcome]}
            </p>
            <ul className="text-caption">
              {preview.items.map((i) => (
                <li key={i.itemId}>
                  {i.code}: {i.meets ? "meets the standard" : i.reasons.join("; ")}
                </li>
              ))}
            </ul>
          </>
        ) : (
          <p className="font-semibold" data-testid="outcome-verdict">
            Outcome by the rule: not decided yet. Still to choose: {undecided.join(", ")}.
          </p>
        )}
        <details className="text-caption text-ink-soft">
          <summary>The rule</summary>
          {DEFAULT_OUTCOME_RULE.text}
        </details>
      </div>

      {amends && (
        <div className="grid gap-3 sm:grid-cols-2">
          <div>
            <label htmlFor={`amend-reason-${amends.checkId}`} className="field-label">
              Reason for the amendment
            </label>
            <input
              id={`amend-reason-${amends.checkId}`}
              value={amendReason}
              onChange={(e) => setAmendReason(e.target.value)}
              className="field-input"
            />
          </div>
          <div>
            <label htmlFor={`amend-pw-${amends.checkId}`} className="field-label">
              Re-enter your password to sign
            </label>
            <input
              id={`amend-pw-${amends.checkId}`}
              type="password"
              autoComplete="current-password"
              value={password}
              onChange={(e) => setPassword(e.target.value)}
              className="field-input"
            />
          </div>
        </div>
      )}

      <div className="flex flex-wrap items-center gap-3">
        <button type="submit" className="btn-primary" disabled={pending}>
          {pending ? "Recording…" : amends ? "Record the amendment" : "Record the check"}
        </button>
        {message && (
          <p role="status" className={message.ok ? "font-semibold text-solid-800" : "field-error"} data-testid="check-message">
            {message.text}
          </p>
        )}
      </div>
    </form>
  );
}

function QuestionFields({
  idx,
  px,
  control,
  register,
  items,
  aircraft,
  err,
  onRemove,
}: {
  idx: number;
  px: string;
  control: Control<FormValues>;
  register: ReturnType<typeof useForm<FormValues>>["register"];
  items: Item[];
  aircraft: AircraftSnapshot[];
  err: (p: string) => React.ReactNode;
  onRemove?: (() => void) | undefined;
}) {
  const q = useWatch({ control, name: `questions.${idx}` });
  const p = `questions.${idx}` as const;
  let generated: ReturnType<typeof generateQuestion> | null = null;
  let problem: string | null = null;
  if (q?.mode === "generated") {
    const snap = aircraft.find((a) => `${a.source.kind}:${a.source.id}` === q.aircraftKey);
    try {
      if (!snap) throw new Error("choose an aircraft");
      generated = generateQuestion(q.kind, snap, generatorInputsOf(q), { answerMode: RULE_OF_THUMB[q.kind] ? q.answerMode : "exact" });
    } catch (e) {
      problem = e instanceof QuestionInputError ? e.boxMessage : e instanceof Error ? e.message : "check the inputs";
    }
  }
  const within = generated && q && q.studentFigure.trim() !== "" ? figureWithinTolerance(generated, Number(q.studentFigure)) : null;
  return (
    <fieldset className="space-y-3 rounded-md border border-paper-edge p-3" data-testid="question">
      <legend className="px-1 font-semibold">Question {idx + 1}</legend>
      <div className="grid gap-3 sm:grid-cols-2">
        <div>
          <label htmlFor={`${px}${p}.item`} className="field-label">
            Syllabus item
          </label>
          <select id={`${px}${p}.item`} {...register(`${p}.syllabusItemId`)} className="field-input">
            <option value="">Choose the item…</option>
            {items.map((i) => (
              <option key={i.id} value={i.id}>
                {i.code} {i.title}
              </option>
            ))}
          </select>
          {err(`${p}.syllabusItemId`)}
        </div>
        <div>
          <label htmlFor={`${px}${p}.mode`} className="field-label">
            Question
          </label>
          <select id={`${px}${p}.mode`} {...register(`${p}.mode`)} className="field-input">
            <option value="written">Written as asked</option>
            <option value="generated">Generated numeric question</option>
          </select>
        </div>
      </div>
      {q?.mode === "generated" ? (
        <div className="space-y-2">
          <div className="grid gap-3 sm:grid-cols-2">
            <div>
              <label htmlFor={`${px}${p}.kind`} className="field-label">
                Kind
              </label>
              <select id={`${px}${p}.kind`} {...register(`${p}.kind`)} className="field-input">
                {QUESTION_KINDS.map((k) => (
                  <option key={k} value={k}>
                    {QUESTION_KIND_LABEL[k]}
                  </option>
                ))}
              </select>
            </div>
            <div>
              <label htmlFor={`${px}${p}.aircraft`} className="field-label">
                Aircraft
              </label>
              <select id={`${px}${p}.aircraft`} {...register(`${p}.aircraftKey`)} className="field-input">
                {aircraft.map((a) => (
                  <option key={`${a.source.kind}:${a.source.id}`} value={`${a.source.kind}:${a.source.id}`}>
                    {a.name}
                    {a.source.kind === "airframe" ? " (Curve Lab airframe)" : a.source.kind === "reference" ? " (reference)" : ""}
                  </option>
                ))}
              </select>
            </div>
          </div>
          {RULE_OF_THUMB[q.kind] && (
            <div className="max-w-md">
              <label htmlFor={`${px}${p}.answerMode`} className="field-label">
                Answer accepted
              </label>
              <select id={`${px}${p}.answerMode`} {...register(`${p}.answerMode`)} className="field-input">
                {ANSWER_MODES.map((m) => (
                  <option key={m} value={m}>
                    {ANSWER_MODE_LABEL[m]}
                    {m === "rule_of_thumb" ? ` (${RULE_OF_THUMB[q.kind]})` : ""}
                  </option>
                ))}
              </select>
            </div>
          )}
          <div className="grid grid-cols-2 gap-3 sm:grid-cols-4">
            {NEEDS[q.kind].map((f) => (
              <div key={f}>
                <label htmlFor={`${px}${p}.${f}`} className="field-label">
                  {INPUT_LABEL[f]}
                </label>
                <input id={`${px}${p}.${f}`} inputMode="decimal" {...register(`${p}.${f}`)} className="field-input num" />
                {err(`${p}.${f}`)}
              </div>
            ))}
          </div>
          {generated ? (
            <div className="rounded-md bg-paper-deep p-2" data-testid="generated-preview">
              <p>{generated.text}</p>
              <p className="text-caption">
                <span className="font-semibold">Answer:</span> {generated.answer.display}
                {generated.tolerance ? ` · ${toleranceText(generated)}` : ""}
              </p>
            </div>
          ) : (
            <p className="field-error">{problem}</p>
          )}
          {generated?.answer.type === "number" && (
            <div className="max-w-xs">
              <label htmlFor={`${px}${p}.figure`} className="field-label">
                Student&apos;s figure ({generated.answer.unit})
              </label>
              <input id={`${px}${p}.figure`} inputMode="decimal" {...register(`${p}.studentFigure`)} className="field-input num" />
              {within !== null && <p className="text-caption font-semibold">{within ? "Within tolerance" : "Outside tolerance"}</p>}
            </div>
          )}
        </div>
      ) : (
        <div>
          <label htmlFor={`${px}${p}.text`} className="field-label">
            Question as asked
          </label>
          <textarea id={`${px}${p}.text`} rows={2} {...register(`${p}.questionText`)} className="field-input py-2" />
          {err(`${p}.questionText`)}
        </div>
      )}
      <div>
        <label htmlFor={`${px}${p}.answer`} className="field-label">
          Answer, in short
        </label>
        <input id={`${px}${p}.answer`} {...register(`${p}.answerSummary`)} className="field-input" />
      </div>
      <fieldset>
        <legend className="field-label">Outcome</legend>
        <div className="mt-1 grid grid-cols-3 gap-2">
          {QUESTION_OUTCOMES.map((o) => (
            <label
              key={o}
              className={`inline-flex min-h-touch cursor-pointer items-center justify-center gap-2 rounded-md border px-2 font-semibold ${o === "solid" ? "has-[:checked]:bg-solid-100 has-[:checked]:border-solid-600" : o === "shaky" ? "has-[:checked]:bg-shaky-100 has-[:checked]:border-shaky-600" : "has-[:checked]:bg-notyet-100 has-[:checked]:border-notyet-600"} border-paper-edge bg-white`}
            >
              <input type="radio" value={o} {...register(`${p}.outcome`)} className="h-5 w-5" />
              {OUTCOME_LABEL[o]}
            </label>
          ))}
        </div>
        {err(`${p}.outcome`)}
      </fieldset>
      <fieldset>
        <legend className="field-label">Element</legend>
        <div className="mt-1 grid grid-cols-2 gap-2">
          {ELEMENT_KINDS.map((k) => (
            <label
              key={k}
              className="inline-flex min-h-touch cursor-pointer items-center justify-center gap-2 rounded-md border border-paper-edge bg-white px-2 has-[:checked]:border-wing-600 has-[:checked]:bg-wing-50"
            >
              <input type="radio" value={k} {...register(`${p}.required`)} className="h-5 w-5" />
              {k === "required" ? "Required element" : "Not a required element"}
            </label>
          ))}
        </div>
        {err(`${p}.required`)}
      </fieldset>
      <div className="flex flex-wrap gap-x-5 gap-y-2">
        {(
          [
            ["prompted", "Needed prompting"],
            ["correctiveGiven", "Corrective instruction given"],
          ] as const
        ).map(([f, label]) => (
          <label key={f} className="inline-flex min-h-touch items-center gap-2">
            <input type="checkbox" {...register(`${p}.${f}`)} className="h-5 w-5" />
            {label}
          </label>
        ))}
        {onRemove && (
          <button type="button" className="btn-quiet" onClick={onRemove}>
            Remove question {idx + 1}
          </button>
        )}
      </div>
    </fieldset>
  );
}
