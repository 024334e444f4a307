"use client";
import { useState } from "react";
import { SHARE_CHOICES, NOTHING_SHARED, type Consent } from "@/lib/sharing/consent";
import { changeSharingAction, changeStudentSharingAction } from "../actions";

type Props = {
  studentId: string;
  sponsorId: string;
  sponsorName: string;
  consent: Consent;
  sponsorStoppedLetter: boolean;
  /** who submits: the student themself, or staff for a minor */
  as: "student" | "staff";
  readOnly: boolean;
};

export function ConsentForm(p: Props) {
  const [consent, setConsent] = useState<Consent>(p.consent);
  const [status, setStatus] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const id = (k: string) => `${p.sponsorId}-${k}`;

  async function save(next: Consent) {
    setBusy(true);
    setStatus(null);
    const send = p.as === "student" ? changeSharingAction : changeStudentSharingAction;
    const res = await send({ studentId: p.studentId, sponsorId: p.sponsorId, ...next });
    setBusy(false);
    if (res.ok) {
      setConsent(next);
      setStatus(res.data.changed ? `Saved. ${p.sponsorName} sees the change now.` : "Nothing changed.");
    } else setStatus(res.message);
  }

  return (
    <form
      onSubmit={(e) => {
        e.preventDefault();
        void save(consent);
      }}
      className="space-y-3"
      aria-label={`What ${p.sponsorName} may see`}
    >
      <fieldset className="space-y-2" disabled={p.readOnly || busy}>
        <legend className="font-semibold">What {p.sponsorName} may see</legend>
        {SHARE_CHOICES.map((c) => (
          <div key={c.key} className="flex items-start gap-3">
            <input
              type="checkbox"
              id={id(c.key)}
              name={c.key}
              className="mt-1 h-5 w-5 shrink-0"
              checked={consent[c.key]}
              onChange={(e) => setConsent({ ...consent, [c.key]: e.target.checked })}
              aria-describedby={id(`${c.key}-hint`)}
            />
            <label htmlFor={id(c.key)} className="min-w-0">
              <span className="block">{c.label}</span>
              <span id={id(`${c.key}-hint`)} className="block text-caption text-ink-soft">
                {c.hint}
              </span>
            </label>
          </div>
        ))}
      </fieldset>
      <fieldset className="space-y-2" disabled={p.readOnly || busy}>
        <legend className="font-semibold">Mail</legend>
        <div className="flex items-start gap-3">
          <input
            type="checkbox"
            id={id("weeklyLetter")}
            name="weeklyLetter"
            className="mt-1 h-5 w-5 shrink-0"
            checked={consent.weeklyLetter}
            onChange={(e) => setConsent({ ...consent, weeklyLetter: e.target.checked })}
            aria-describedby={id("weeklyLetter-hint")}
          />
          <label htmlFor={id("weeklyLetter")} className="min-w-0">
            <span className="block">Send {p.sponsorName} the Weekly letter</span>
            <span id={id("weeklyLetter-hint")} className="block text-caption text-ink-soft">
              The letter carries only what you tick above.
              {p.sponsorStoppedLetter && ` ${p.sponsorName} has stopped the letter themself; only they can turn it back on.`}
            </span>
          </label>
        </div>
      </fieldset>
      {!p.readOnly && (
        <div className="flex flex-wrap gap-2">
          <button type="submit" className="btn-primary" disabled={busy}>
            Save for {p.sponsorName}
          </button>
          <button type="button" className="btn-quiet" disabled={busy} onClick={() => void save(NOTHING_SHARED)}>
            Withdraw everything
          </button>
        </div>
      )}
      <p role="status" aria-live="polite" className="text-caption">
        {status}
      </p>
    </form>
  );
}
