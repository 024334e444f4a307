"use client";
import { useState, useTransition } from "react";
import { useRouter } from "next/navigation";
import { ScrollArea } from "@/components/ui/scroll-area";
import { conductStageCheckAction } from "../../actions";
import { QUESTION_OUTCOMES, OUTCOME_LABEL, type QuestionOutcome } from "@/lib/records/outcome";
import { STAGE_RESULT_WORDS, words } from "@/lib/labels";

export function StageCheckForm({
  studentId,
  stageId,
  stageCode,
  items,
  isLead,
  mayOverride,
  passMark,
  statement,
}: {
  studentId: string;
  stageId: string;
  stageCode: string;
  items: { id: string; code: string; title: string }[];
  isLead: boolean;
  mayOverride: boolean;
  passMark: number;
  /** the certification statement the examiner signs (as for a sign-off) */
  statement: string;
}) {
  // Nothing starts as a pass: every oral outcome and the result are chosen by the examiner.
  const [outcomes, setOutcomes] = useState<Record<string, QuestionOutcome | "">>({});
  const [written, setWritten] = useState("");
  const [result, setResult] = useState<"pass" | "fail" | "">("");
  const [password, setPassword] = useState("");
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [remarks, setRemarks] = useState("");
  const [override, setOverride] = useState("");
  const [message, setMessage] = useState<string | null>(null);
  const [pending, start] = useTransition();
  const router = useRouter();
  if (isLead && !mayOverride)
    return (
      <p className="text-caption text-ink-soft">
        You lead this student&apos;s cohort: another examiner conducts the {stageCode} stage check.
      </p>
    );
  return (
    <form
      className="space-y-3 rounded-md border border-paper-edge p-3"
      aria-label={`Stage check ${stageCode}`}
      onSubmit={(e) => {
        e.preventDefault();
        const missing: Record<string, string> = {};
        for (const i of items) if (!outcomes[i.id]) missing[`outcome-${i.id}`] = `choose the oral outcome of ${i.code}`;
        if (!result) missing.result = "choose the result: pass or fail";
        if (password === "") missing.password = "re-enter your password";
        setErrors(missing);
        if (Object.keys(missing).length > 0) {
          setMessage(`Still to choose: ${Object.values(missing).join("; ")}`);
          return;
        }
        start(async () => {
          const r = await conductStageCheckAction({
            studentId,
            stageId,
            result,
            password,
            oralOutcomes: items.map((i) => ({ itemId: i.id, outcome: outcomes[i.id] })),
            writtenScorePercent: written.trim() === "" ? null : Number(written),
            remarks,
            occurredAt: new Date().toISOString(),
            overrideReason: override || undefined,
          });
          setMessage(
            r.ok
              ? `Recorded: ${words(STAGE_RESULT_WORDS, r.data.result).toLowerCase()}${r.data.makeupItemsOpened ? `, ${r.data.makeupItemsOpened} make-up items opened` : ""}`
              : r.message,
          );
          if (r.ok) {
            setPassword("");
            router.refresh();
          } else {
            // the server names each item left without an oral outcome: show it on that item's row
            const onRows: Record<string, string> = {};
            for (const [field, msgs] of Object.entries(r.fieldErrors ?? {})) {
              const item = /^oralOutcomes\.([0-9a-f-]{36})\.outcome$/.exec(field)?.[1];
              if (item && msgs[0]) onRows[`outcome-${item}`] = msgs[0];
            }
            setErrors(r.field && !/^oralOutcomes\./.test(r.field) ? { ...onRows, [r.field]: r.message } : onRows);
          }
        });
      }}
    >
      <h3 className="font-semibold">Conduct the {stageCode} stage check</h3>
      <ScrollArea label="Items of the stage check, scrolls sideways">
        <table className="data-table">
          <thead>
            <tr>
              <th scope="col">Item</th>
              <th scope="col">Oral outcome</th>
            </tr>
          </thead>
          <tbody>
            {items.map((i) => (
              <tr key={i.id}>
                <td>
                  <span className="num">{i.code}</span> {i.title}
                </td>
                <td>
                  <label className="sr-only" htmlFor={`sc-${i.id}`}>
                    Oral outcome for {i.code}
                  </label>
                  <select
                    id={`sc-${i.id}`}
                    className="field-input"
                    value={outcomes[i.id] ?? ""}
                    aria-invalid={errors[`outcome-${i.id}`] ? true : undefined}
                    onChange={(e) => setOutcomes({ ...outcomes, [i.id]: e.target.value as QuestionOutcome })}
                  >
                    <option value="">Choose…</option>
                    {QUESTION_OUTCOMES.map((o) => (
                      <option key={o} value={o}>
                        {OUTCOME_LABEL[o]}
                      </option>
                    ))}
                  </select>
                  {errors[`outcome-${i.id}`] && (
                    <p className="field-error" role="alert">
                      {errors[`outcome-${i.id}`]}
                    </p>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </ScrollArea>
      <div className="grid gap-3 sm:grid-cols-2">
        <div>
          <label htmlFor={`written-${stageId}`} className="field-label">
            Written test score, % (optional; pass mark {passMark} %)
          </label>
          <input
            id={`written-${stageId}`}
            inputMode="decimal"
            className="field-input num"
            value={written}
            onChange={(e) => setWritten(e.target.value)}
          />
        </div>
        <div>
          <label htmlFor={`result-${stageId}`} className="field-label">
            Result
          </label>
          <select
            id={`result-${stageId}`}
            className="field-input"
            value={result}
            aria-invalid={errors.result ? true : undefined}
            onChange={(e) => setResult(e.target.value as "pass" | "fail")}
          >
            <option value="">Choose the result…</option>
            <option value="pass">Pass</option>
            <option value="fail">Fail (opens make-up items)</option>
          </select>
          {errors.result && (
            <p className="field-error" role="alert">
              {errors.result}
            </p>
          )}
        </div>
      </div>
      {isLead && (
        <div>
          <label htmlFor={`override-${stageId}`} className="field-label">
            You lead this student&apos;s cohort: reason to examine anyway (raises a watch note)
          </label>
          <input id={`override-${stageId}`} className="field-input" value={override} onChange={(e) => setOverride(e.target.value)} />
        </div>
      )}
      <div>
        <label htmlFor={`remarks-${stageId}`} className="field-label">
          Remarks (internal)
        </label>
        <input id={`remarks-${stageId}`} className="field-input" value={remarks} onChange={(e) => setRemarks(e.target.value)} />
      </div>
      <p className="font-semibold">Statement</p>
      <blockquote className="border-l-4 border-wing-600 pl-3" data-testid="stage-statement">
        {statement}
      </blockquote>
      <div>
        <label htmlFor={`sc-pw-${stageId}`} className="field-label">
          Re-enter your password to sign
        </label>
        <input
          id={`sc-pw-${stageId}`}
          type="password"
          autoComplete="current-password"
          value={password}
          onChange={(e) => setPassword(e.target.value)}
          className="field-input"
          aria-invalid={errors.password ? true : undefined}
        />
        {errors.password && (
          <p className="field-error" role="alert">
            {errors.password}
          </p>
        )}
      </div>
      <button type="submit" className="btn-primary" disabled={pending}>
        Sign the stage check
      </button>
      {message && (
        <p role="status" className="font-semibold">
          {message}
        </p>
      )}
    </form>
  );
}
