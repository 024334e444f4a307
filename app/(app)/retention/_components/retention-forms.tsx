"use client";
import { useRouter } from "next/navigation";
import { useId, useState } from "react";
import type { RetentionSettingsInput } from "@/lib/retention/schema";
import { archiveRecordAction, liftLegalHoldAction, saveRetentionSettingsAction, setLegalHoldAction } from "../actions";

type Result = { ok: true } | { ok: false; message: string; fieldErrors?: Record<string, string[]> };

function useSubmit() {
  const router = useRouter();
  const [message, setMessage] = useState<string | null>(null);
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const [busy, setBusy] = useState(false);
  async function run(call: () => Promise<Result>, done: string) {
    setBusy(true);
    const res = await call();
    setBusy(false);
    setErrors(res.ok ? {} : (res.fieldErrors ?? {}));
    setMessage(res.ok ? done : res.message);
    if (res.ok) router.refresh();
  }
  return { message, errors, busy, run };
}

const RULES: { name: keyof RetentionSettingsInput; label: string; source: string }[] = [
  { name: "schoolRecords", label: "School training records: 1 year", source: "14 CFR 141.101(d)" },
  { name: "instructorRecords", label: "Instructor records: 3 years", source: "14 CFR 61.189(c)" },
  { name: "easaAto", label: "EASA training organisation: 3 years", source: "EASA ORA.ATO.120" },
];

/** The chief's choice of the retention rules that apply to the school. */
export function RetentionSettingsForm({ settings }: { settings: RetentionSettingsInput }) {
  const { message, errors, busy, run } = useSubmit();
  return (
    <form
      className="card space-y-3"
      aria-label="Retention rules"
      noValidate
      onSubmit={(e) => {
        e.preventDefault();
        const f = new FormData(e.currentTarget);
        void run(
          () =>
            saveRetentionSettingsAction({
              schoolRecords: f.get("schoolRecords") === "on",
              instructorRecords: f.get("instructorRecords") === "on",
              easaAto: f.get("easaAto") === "on",
            }),
          "Retention rules saved.",
        );
      }}
    >
      <fieldset aria-describedby={errors.schoolRecords ? "rules-error" : undefined}>
        <legend className="field-label">Rules that apply, counted from the end of training (the longest wins)</legend>
        {RULES.map((r) => (
          <label key={r.name} className="flex min-h-10 items-center gap-2">
            <input type="checkbox" name={r.name} defaultChecked={settings[r.name]} />
            <span>
              {r.label} <span className="text-caption text-ink-soft">({r.source})</span>
            </span>
          </label>
        ))}
        {errors.schoolRecords && (
          <p id="rules-error" className="field-error">
            {errors.schoolRecords[0]}
          </p>
        )}
      </fieldset>
      <button type="submit" className="btn-primary" disabled={busy}>
        Save the rules
      </button>
      <div aria-live="polite">{message && <p className="text-ink-soft">{message}</p>}</div>
    </form>
  );
}

/** A one-field form that sends a reason: setting and lifting a legal hold. */
function HoldReasonForm(props: {
  label: string;
  fieldLabel: string;
  submitLabel: string;
  done: string;
  send: (reason: string) => Promise<Result>;
}) {
  const id = useId();
  const { message, errors, busy, run } = useSubmit();
  return (
    <form
      className="mt-2 space-y-2"
      aria-label={props.label}
      noValidate
      onSubmit={(e) => {
        e.preventDefault();
        const reason = String(new FormData(e.currentTarget).get("reason") ?? "");
        void run(() => props.send(reason), props.done);
      }}
    >
      <label htmlFor={`${id}-reason`} className="field-label">
        {props.fieldLabel}
      </label>
      <input
        id={`${id}-reason`}
        name="reason"
        className="field-input"
        maxLength={2000}
        {...(errors.reason ? { "aria-invalid": true, "aria-describedby": `${id}-error` } : {})}
      />
      {errors.reason && (
        <p id={`${id}-error`} className="field-error">
          {errors.reason[0]}
        </p>
      )}
      <button type="submit" className="btn-quiet" disabled={busy}>
        {props.submitLabel}
      </button>
      <div aria-live="polite">{message && <p className="text-caption text-ink-soft">{message}</p>}</div>
    </form>
  );
}

/** Set a legal hold (with a reason) on one student's record. */
export function SetHoldForm({ studentId, name }: { studentId: string; name: string }) {
  const [key] = useState(() => crypto.randomUUID());
  return (
    <HoldReasonForm
      label={`Legal hold on the record of ${name}`}
      fieldLabel="Reason for a legal hold"
      submitLabel="Set a legal hold"
      done="Legal hold set."
      send={(reason) => setLegalHoldAction({ studentId, reason, idempotencyKey: key })}
    />
  );
}

/** Lift a legal hold, with a reason. */
export function LiftHoldForm({ holdId, name }: { holdId: string; name: string }) {
  return (
    <HoldReasonForm
      label={`Lift the legal hold on the record of ${name}`}
      fieldLabel="Reason for lifting the hold"
      submitLabel="Lift the hold"
      done="Legal hold lifted."
      send={(reason) => liftLegalHoldAction({ holdId, reason })}
    />
  );
}

/** Mark a record archived, after a second press that confirms it. */
export function ArchiveButton({ studentId, name }: { studentId: string; name: string }) {
  const [confirming, setConfirming] = useState(false);
  const { message, busy, run } = useSubmit();
  return (
    <div className="mt-2 space-y-2">
      {confirming ? (
        <div className="flex flex-wrap gap-2">
          <button
            type="button"
            className="btn-primary"
            disabled={busy}
            onClick={() => void run(() => archiveRecordAction({ studentId }), "Marked archived.")}
          >
            Mark the record of {name} archived
          </button>
          <button type="button" className="btn-quiet" onClick={() => setConfirming(false)}>
            Keep it listed
          </button>
        </div>
      ) : (
        <button type="button" className="btn-quiet" onClick={() => setConfirming(true)}>
          Archive…
        </button>
      )}
      <div aria-live="polite">{message && <p className="text-caption text-ink-soft">{message}</p>}</div>
    </div>
  );
}
