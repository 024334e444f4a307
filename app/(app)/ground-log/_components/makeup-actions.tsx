"use client";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { scheduleMakeupAction, closeMakeupAction, waiveMakeupAction } from "../actions";
import { makeupCloseSchema, makeupWaiveSchema } from "@/lib/timetable/schema";

/** Plan, close or waive one make-up item. */
export function MakeupActions({
  itemId,
  state,
  canWaive,
  sessions,
}: {
  itemId: string;
  state: "open" | "scheduled";
  canWaive: boolean;
  sessions: { id: string; label: string }[];
}) {
  const router = useRouter();
  const [mode, setMode] = useState<"none" | "plan" | "close" | "waive">("none");
  const [value, setValue] = useState("");
  const [how, setHow] = useState<"one_to_one" | "oral_check">("one_to_one");
  const [msg, setMsg] = useState<string | null>(null);
  const [password, setPassword] = useState("");
  const [passwordError, setPasswordError] = useState<string | null>(null);
  async function submit(e: React.FormEvent) {
    e.preventDefault();
    setMsg(null);
    setPasswordError(null);
    let r;
    if (mode === "plan") r = await scheduleMakeupAction({ itemId, sessionId: value });
    else if (mode === "close") {
      const p = makeupCloseSchema.safeParse({ itemId, how, note: value });
      if (!p.success) return setMsg(p.error.issues[0]?.message ?? "invalid");
      r = await closeMakeupAction(p.data);
    } else {
      const p = makeupWaiveSchema.safeParse({ itemId, reason: value, password });
      if (!p.success) {
        const issue = p.error.issues[0];
        if (issue?.path[0] === "password") return setPasswordError(issue.message);
        return setMsg(`reason: ${issue?.message ?? "invalid"}`);
      }
      r = await waiveMakeupAction(p.data);
    }
    if (r.ok) {
      setMode("none");
      setValue("");
      setPassword("");
      router.refresh();
    } else if (r.field === "password") {
      // a wrong password: said beside the field, which is emptied for another try
      setPassword("");
      setPasswordError(r.fieldErrors?.password?.[0] ?? r.message);
    } else setMsg(r.message);
  }
  if (mode === "none") {
    return (
      <div className="flex flex-wrap gap-2">
        {state === "open" && sessions.length > 0 && (
          <button
            type="button"
            className="btn-quiet"
            onClick={() => {
              setMode("plan");
              setValue(sessions[0]!.id);
            }}
          >
            Plan into a session
          </button>
        )}
        <button type="button" className="btn-quiet" onClick={() => setMode("close")}>
          Mark done
        </button>
        {canWaive && (
          <button type="button" className="btn-quiet" onClick={() => setMode("waive")}>
            Waive
          </button>
        )}
      </div>
    );
  }
  return (
    <form onSubmit={submit} className="min-w-60 space-y-2" noValidate>
      {mode === "plan" && (
        <div>
          <label htmlFor={`mk-s-${itemId}`} className="field-label">
            Session
          </label>
          <select id={`mk-s-${itemId}`} className="field-input" value={value} onChange={(e) => setValue(e.target.value)}>
            {sessions.map((s) => (
              <option key={s.id} value={s.id}>
                {s.label}
              </option>
            ))}
          </select>
        </div>
      )}
      {mode === "close" && (
        <>
          <div>
            <label htmlFor={`mk-h-${itemId}`} className="field-label">
              Made up by
            </label>
            <select
              id={`mk-h-${itemId}`}
              className="field-input"
              value={how}
              onChange={(e) => setHow(e.target.value as "one_to_one" | "oral_check")}
            >
              <option value="one_to_one">A one-to-one briefing</option>
              <option value="oral_check">Self-study, closed by an oral check</option>
            </select>
          </div>
          <div>
            <label htmlFor={`mk-n-${itemId}`} className="field-label">
              Note (optional)
            </label>
            <input id={`mk-n-${itemId}`} className="field-input" value={value} onChange={(e) => setValue(e.target.value)} />
          </div>
        </>
      )}
      {mode === "waive" && (
        <div>
          <label htmlFor={`mk-w-${itemId}`} className="field-label">
            Reason for the waiver
          </label>
          <input id={`mk-w-${itemId}`} className="field-input" value={value} onChange={(e) => setValue(e.target.value)} />
          <label htmlFor={`mk-pw-${itemId}`} className="field-label mt-2">
            Re-enter your password to sign the waiver
          </label>
          <input
            id={`mk-pw-${itemId}`}
            type="password"
            autoComplete="current-password"
            className="field-input"
            value={password}
            onChange={(e) => setPassword(e.target.value)}
            aria-invalid={!!passwordError}
            aria-describedby={passwordError ? `mk-pw-${itemId}-error` : undefined}
          />
          {passwordError && (
            <p id={`mk-pw-${itemId}-error`} role="alert" className="field-error">
              {passwordError}
            </p>
          )}
        </div>
      )}
      {msg && (
        <p role="alert" className="field-error">
          {msg}
        </p>
      )}
      <div className="flex gap-2">
        <button type="submit" className="btn-primary">
          Save
        </button>
        <button type="button" className="btn-quiet" onClick={() => setMode("none")}>
          Back
        </button>
      </div>
    </form>
  );
}
