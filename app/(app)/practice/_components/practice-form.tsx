"use client";
import { useState, useTransition } from "react";
import { useRouter } from "next/navigation";
import { answerPracticeAction, submitPracticeTestAction } from "../actions";
import type { PracticeAnswer } from "@/lib/practice/schema";

export interface ShownQuestion {
  key: string;
  demoRevisionId: string;
  itemId: string | null;
  itemLabel: string | null;
  kind: PracticeAnswer["kind"];
  inputs: PracticeAnswer["inputs"];
  text: string;
  answerType: "number" | "choice";
  unit: string;
}

type Scored = { correct: boolean; worked: string; tolerance: string };

function answerOf(q: ShownQuestion, value: string): PracticeAnswer {
  const base = { demoRevisionId: q.demoRevisionId, itemId: q.itemId, kind: q.kind, inputs: q.inputs };
  if (q.answerType === "choice") return value === "stable" || value === "unstable" ? { ...base, choice: value } : base;
  const n = Number(value.replace(",", "."));
  return value.trim() === "" || !Number.isFinite(n) ? base : { ...base, figure: n };
}

function QuestionField({ q, index, value, onChange }: { q: ShownQuestion; index: number; value: string; onChange: (v: string) => void }) {
  const id = `pq-${q.key}`;
  return (
    <div>
      <p className="font-medium" id={`${id}-text`}>
        {index + 1}. {q.text}
      </p>
      {q.itemLabel && <p className="text-caption text-ink-soft">Syllabus item {q.itemLabel}</p>}
      {q.answerType === "choice" ? (
        <fieldset className="mt-1">
          <legend className="sr-only">Your answer to question {index + 1}</legend>
          {(["stable", "unstable"] as const).map((c) => (
            <label key={c} className="mr-4 inline-flex min-h-touch items-center gap-2">
              <input type="radio" name={id} value={c} checked={value === c} onChange={() => onChange(c)} />
              {c === "stable" ? "Speed-stable side" : "Speed-unstable side"}
            </label>
          ))}
        </fieldset>
      ) : (
        <label className="mt-1 flex flex-wrap items-center gap-2" htmlFor={id}>
          <span>Your answer ({q.unit})</span>
          <input id={id} className="field-input w-32" inputMode="decimal" value={value} onChange={(e) => onChange(e.target.value)} />
        </label>
      )}
    </div>
  );
}

function Result({ r }: { r: Scored }) {
  return (
    <div role="status" className="mt-2" data-testid="practice-result">
      <p className={`font-semibold ${r.correct ? "text-solid-800" : "text-notyet-800"}`}>{r.correct ? "Right" : "Not right this time"}</p>
      <p className="text-caption">
        Worked answer: {r.worked}
        {r.tolerance ? ` (${r.tolerance})` : ""}
      </p>
    </div>
  );
}

/** One practice question: answered and scored at once, with the worked answer. */
export function PracticeQuestion({ q }: { q: ShownQuestion }) {
  const [value, setValue] = useState("");
  const [key] = useState(() => crypto.randomUUID());
  const [result, setResult] = useState<Scored | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [pending, start] = useTransition();
  const router = useRouter();
  return (
    <form
      className="border-b border-paper-edge py-3"
      data-testid="practice-question"
      onSubmit={(e) => {
        e.preventDefault();
        start(async () => {
          const r = await answerPracticeAction({ ...answerOf(q, value), idempotencyKey: key });
          if (r.ok) {
            setResult(r.data);
            setError(null);
            router.refresh();
          } else setError(r.message);
        });
      }}
    >
      <QuestionField q={q} index={0} value={value} onChange={setValue} />
      {!result && (
        <button type="submit" className="btn-primary mt-2" disabled={pending}>
          Check my answer
        </button>
      )}
      {error && (
        <p role="alert" className="field-error">
          {error}
        </p>
      )}
      {result && <Result r={result} />}
    </form>
  );
}

/** A practice test: every question answered, then scored together against the school's pass mark. */
export function PracticeTest({ questions, passMark }: { questions: ShownQuestion[]; passMark: number }) {
  const [values, setValues] = useState<string[]>(() => questions.map(() => ""));
  const [key] = useState(() => crypto.randomUUID());
  const [result, setResult] = useState<{
    scored: Scored[];
    result: { correct: number; total: number; percent: number; passed: boolean };
  } | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [pending, start] = useTransition();
  const router = useRouter();
  return (
    <form
      data-testid="practice-test"
      onSubmit={(e) => {
        e.preventDefault();
        start(async () => {
          const r = await submitPracticeTestAction({ answers: questions.map((q, i) => answerOf(q, values[i] ?? "")), idempotencyKey: key });
          if (r.ok) {
            setResult(r.data);
            setError(null);
            router.refresh();
          } else setError(r.message);
        });
      }}
    >
      <ol className="space-y-3">
        {questions.map((q, i) => (
          <li key={q.key}>
            <QuestionField
              q={q}
              index={i}
              value={values[i] ?? ""}
              onChange={(v) => setValues((vs) => vs.map((x, j) => (j === i ? v : x)))}
            />
            {result?.scored[i] && <Result r={result.scored[i]} />}
          </li>
        ))}
      </ol>
      {!result && (
        <button type="submit" className="btn-primary mt-3" disabled={pending}>
          Hand in the practice test
        </button>
      )}
      {error && (
        <p role="alert" className="field-error">
          {error}
        </p>
      )}
      {result && (
        <p role="status" className="mt-3 font-semibold" data-testid="practice-test-result">
          {result.result.correct} of {result.result.total} right ({result.result.percent} %):{" "}
          {result.result.passed ? "at or above" : "below"} the pass mark of {passMark} %.
        </p>
      )}
    </form>
  );
}
