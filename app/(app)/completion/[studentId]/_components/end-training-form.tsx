"use client";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm, useWatch } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import type { z } from "zod";
import { endTrainingSchema, type EndKind } from "@/lib/completion/schema";
import { endTrainingAction } from "../../actions";

type In = z.input<typeof endTrainingSchema>;
type Out = z.output<typeof endTrainingSchema>;

const KIND_CHOICES: { kind: EndKind; label: string; hint: string }[] = [
  {
    kind: "graduated",
    label: "Graduated",
    hint: "the course complete: every item signed off, every stage check passed, no make-up item open, the minimum ground time credited",
  },
  { kind: "terminated", label: "Withdrawn from the course", hint: "training ends here, for the reason given" },
  { kind: "transferred", label: "Transferred to another school", hint: "the record goes with the student" },
];
const FIELDS = ["kind", "endedOn", "reason", "statement", "password"] as const;
const FIELD_WORDS: Record<(typeof FIELDS)[number], string> = {
  kind: "How training ends",
  endedOn: "the date",
  reason: "Reason",
  statement: "the certification statement",
  password: "the password",
};

/** The chief ends a student's training: how, when and why, the certification statement, and the password re-entered to sign. */
export function EndTrainingForm({
  studentId,
  studentName,
  today,
  statements,
}: {
  studentId: string;
  studentName: string;
  today: string;
  statements: Record<EndKind, string>;
}) {
  const router = useRouter();
  const [idempotencyKey] = useState(() => crypto.randomUUID());
  const [failure, setFailure] = useState<string | null>(null);
  const [statementEdited, setStatementEdited] = useState(false);
  const {
    register,
    handleSubmit,
    setValue,
    setError,
    control,
    formState: { errors, isSubmitting },
  } = useForm<In, unknown, Out>({
    resolver: zodResolver(endTrainingSchema),
    defaultValues: { studentId, kind: "graduated", endedOn: today, reason: "", statement: statements.graduated, password: "" },
  });
  const kind = useWatch({ control, name: "kind" }) as EndKind;

  async function onSubmit(data: Out) {
    setFailure(null);
    const r = await endTrainingAction({ ...data, idempotencyKey });
    if (r.ok) {
      router.refresh();
      return;
    }
    const beside = Object.entries(r.fieldErrors ?? {}).filter(([f]) => (FIELDS as readonly string[]).includes(f));
    for (const [f, m] of beside) setError(f as (typeof FIELDS)[number], { message: m[0] });
    // a refusal shown beside its field is not repeated here: this line says where to look
    setFailure(beside.length ? `Not signed: see ${FIELD_WORDS[beside[0]![0] as (typeof FIELDS)[number]]} above.` : r.message);
  }
  const error = (name: (typeof FIELDS)[number]) =>
    errors[name] ? (
      <p id={`et-${name}-error`} className="field-error">
        {String(errors[name]?.message)}
      </p>
    ) : null;
  const described = (name: (typeof FIELDS)[number]) => ({
    "aria-invalid": !!errors[name],
    "aria-describedby": errors[name] ? `et-${name}-error` : undefined,
  });

  return (
    <form onSubmit={handleSubmit(onSubmit)} className="space-y-4" aria-label={`End the training of ${studentName}`} noValidate>
      <fieldset>
        <legend className="field-label">How training ends</legend>
        <div className="space-y-2">
          {KIND_CHOICES.map((c) => (
            <label key={c.kind} className="flex items-start gap-2">
              <input
                type="radio"
                value={c.kind}
                className="mt-1"
                {...register("kind", {
                  onChange: (e: React.ChangeEvent<HTMLInputElement>) => {
                    if (!statementEdited) setValue("statement", statements[e.target.value as EndKind]);
                  },
                })}
              />
              <span>
                <span className="font-semibold">{c.label}</span>
                <span className="block text-caption text-ink-soft">{c.hint}</span>
              </span>
            </label>
          ))}
        </div>
        {error("kind")}
      </fieldset>
      <div>
        <label htmlFor="et-endedOn" className="field-label">
          {kind === "graduated" ? "Graduation date" : kind === "transferred" ? "Date of the transfer" : "Date training ended"}
        </label>
        <input id="et-endedOn" type="date" max={today} className="field-input" {...described("endedOn")} {...register("endedOn")} />
        {error("endedOn")}
      </div>
      <div>
        <label htmlFor="et-reason" className="field-label">
          Reason
        </label>
        <textarea
          id="et-reason"
          rows={2}
          className="field-input"
          placeholder={kind === "graduated" ? "e.g. completed the course" : ""}
          {...described("reason")}
          {...register("reason")}
        />
        {error("reason")}
      </div>
      <div>
        <label htmlFor="et-statement" className="field-label">
          Certification statement (you may reword it)
        </label>
        <textarea
          id="et-statement"
          rows={4}
          className="field-input"
          {...described("statement")}
          {...register("statement", { onChange: () => setStatementEdited(true) })}
        />
        {error("statement")}
      </div>
      <div>
        <label htmlFor="et-password" className="field-label">
          Re-enter your password to sign
        </label>
        <input
          id="et-password"
          type="password"
          autoComplete="current-password"
          className="field-input"
          {...described("password")}
          {...register("password")}
        />
        {error("password")}
      </div>
      <div aria-live="polite">
        {failure && (
          <p role="alert" className="field-error" data-testid="end-training-failure">
            {failure}
          </p>
        )}
      </div>
      <button type="submit" className="btn-primary" disabled={isSubmitting}>
        {isSubmitting ? "Signing…" : "Sign and end training"}
      </button>
    </form>
  );
}
