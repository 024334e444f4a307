"use client";
import { useState } from "react";
import { WEEKDAYS } from "@/lib/mail/schemas";
import { saveSchoolSettingsAction } from "../actions";

interface Values {
  mailSenderName: string;
  reminderLeadHours: number;
  weeklyLetterDay: number;
  checkValidityDays: number;
  stageCheckPassMarkPercent: number;
  lateEntryDays: number;
  authority: string;
}

export function SettingsForm({ initial, schoolName }: { initial: Values; schoolName: string }) {
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const [status, setStatus] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const f = new FormData(e.currentTarget);
    const input = Object.fromEntries([...f.entries()].map(([k, v]) => [k, String(v)]));
    setBusy(true);
    setStatus(null);
    const res = await saveSchoolSettingsAction(input);
    setBusy(false);
    if (res.ok) {
      setErrors({});
      setStatus("Settings saved.");
    } else {
      setErrors(res.fieldErrors ?? {});
      setStatus(res.message);
    }
  }

  const err = (name: keyof Values) =>
    errors[name] ? (
      <p id={`${name}-error`} className="field-error">
        {errors[name][0]}
      </p>
    ) : null;
  const described = (name: keyof Values, hint?: boolean) =>
    [hint ? `${name}-hint` : "", errors[name] ? `${name}-error` : ""].filter(Boolean).join(" ") || undefined;
  const num = (name: keyof Values, label: string, unit: string, hint: string) => (
    <div>
      <label htmlFor={name} className="field-label">
        {label} ({unit})
      </label>
      <input
        id={name}
        name={name}
        type="number"
        inputMode="numeric"
        defaultValue={String(initial[name])}
        required
        aria-invalid={errors[name] ? true : undefined}
        aria-describedby={described(name, true)}
        className="field-input num"
      />
      <p id={`${name}-hint`} className="mt-1 text-caption text-ink-soft">
        {hint}
      </p>
      {err(name)}
    </div>
  );

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-6">
      <fieldset className="card space-y-4">
        <legend className="px-1 text-lead font-semibold">Mail</legend>
        <div>
          <label htmlFor="mailSenderName" className="field-label">
            Sender name
          </label>
          <input
            id="mailSenderName"
            name="mailSenderName"
            defaultValue={initial.mailSenderName}
            maxLength={80}
            aria-invalid={errors.mailSenderName ? true : undefined}
            aria-describedby={described("mailSenderName", true)}
            className="field-input"
          />
          <p id="mailSenderName-hint" className="mt-1 text-caption text-ink-soft">
            Shown as the sender of every mail. Empty: “{schoolName}”.
          </p>
          {err("mailSenderName")}
        </div>
        {num("reminderLeadHours", "Session reminder lead time", "hours", "Attendees get a reminder this long before a session (1 to 168).")}
        <div>
          <label htmlFor="weeklyLetterDay" className="field-label">
            Weekly letter day
          </label>
          <select
            id="weeklyLetterDay"
            name="weeklyLetterDay"
            defaultValue={String(initial.weeklyLetterDay)}
            aria-describedby={described("weeklyLetterDay", true)}
            className="field-input"
          >
            {WEEKDAYS.map((d, i) => (
              <option key={d} value={i}>
                {d}
              </option>
            ))}
          </select>
          <p id="weeklyLetterDay-hint" className="mt-1 text-caption text-ink-soft">
            Sponsors get the Weekly letter on this day from 17:00, school time.
          </p>
          {err("weeklyLetterDay")}
        </div>
      </fieldset>
      <fieldset className="card space-y-4">
        <legend className="px-1 text-lead font-semibold">Records</legend>
        {num("checkValidityDays", "Oral check valid for a sign-off", "days", "A sign-off may rest on an oral check no older than this.")}
        {num(
          "stageCheckPassMarkPercent",
          "Stage check written pass mark",
          "%",
          "The written part of a stage check passes at this mark or above.",
        )}
        {num("lateEntryDays", "Late entry after", "days", "Records entered more than this long after the event raise a watch note.")}
        <div>
          <label htmlFor="authority" className="field-label">
            Approving authority
          </label>
          <input
            id="authority"
            name="authority"
            defaultValue={initial.authority}
            maxLength={100}
            aria-invalid={errors.authority ? true : undefined}
            aria-describedby={described("authority")}
            className="field-input"
          />
          {err("authority")}
        </div>
      </fieldset>
      <div className="flex flex-wrap items-center gap-4">
        <button type="submit" disabled={busy} className="btn-primary">
          {busy ? "Saving…" : "Save settings"}
        </button>
        <p aria-live="polite" role="status" className="text-body" data-testid="settings-status">
          {status}
        </p>
      </div>
    </form>
  );
}
