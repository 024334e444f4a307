"use client";
import { useState, useTransition } from "react";
import { useRouter } from "next/navigation";
import { conductStageCheckAction } from "../../actions";
import { QUESTION_OUTCOMES, OUTCOME_LABEL, type QuestionOutcome } from "@/lib/records/outcome";

export function StageCheckForm({
  studentId,
  stageId,
  stageCode,
  items,
  isLead,
  mayOverride,
  passMark,
}: {
  studentId: string;
  stageId: string;
  stageCode: string;
  items: { id: string; code: string; title: string }[];
  isLead: boolean;
  mayOverride: boolean;
  passMark: number;
}) {
  const [outcomes, setOutcomes] = useState<Record<string, QuestionOutcome>>(Object.fromEntries(items.map((i) => [i.id, "solid"])));
  const [written, setWritten] = useState("");
  const [result, setResult] = useState<"pass" | "fail">("pass");
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
        start(async () => {
          const r = await conductStageCheckAction({
            studentId,
            stageId,
            result,
            oralOutcomes: items.map((i) => ({ itemId: i.id, outcome: outcomes[i.id] ?? "solid" })),
            writtenScorePercent: written.trim() === "" ? null : Number(written),
            remarks,
            occurredAt: new Date().toISOString(),
            overrideReason: override || undefined,
          });
          setMessage(
            r.ok
              ? `Recorded: ${r.data.result}${r.data.makeupItemsOpened ? `, ${r.data.makeupItemsOpened} make-up items opened` : ""}`
              : r.message,
          );
          if (r.ok) router.refresh();
        });
      }}
    >
      <h3 className="font-semibold">Conduct the {stageCode} stage check</h3>
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
                  value={outcomes[i.id]}
                  onChange={(e) => setOutcomes({ ...outcomes, [i.id]: e.target.value as QuestionOutcome })}
                >
                  {QUESTION_OUTCOMES.map((o) => (
                    <option key={o} value={o}>
                      {OUTCOME_LABEL[o]}
                    </option>
                  ))}
                </select>
              </td>
            </tr>
          ))}
        </tbody>
      </table>
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
            onChange={(e) => setResult(e.target.value as "pass" | "fail")}
          >
            <option value="pass">Pass</option>
            <option value="fail">Fail (opens make-up items)</option>
          </select>
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
      <button type="submit" className="btn-primary" disabled={pending}>
        Record the stage check
      </button>
      {message && (
        <p role="status" className="font-semibold">
          {message}
        </p>
      )}
    </form>
  );
}
