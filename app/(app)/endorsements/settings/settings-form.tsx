"use client";
import { useRouter } from "next/navigation";
import { useState } from "react";
import type { AuthoritySettings } from "@/lib/endorsements/rules";
import { saveAuthoritySettingsAction } from "../actions";

type Errors = Record<string, string[]>;

/** The chief's form for the authority settings. */
export function AuthoritySettingsForm({ settings }: { settings: AuthoritySettings }) {
  const router = useRouter();
  const [errors, setErrors] = useState<Errors>({});
  const [message, setMessage] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function save(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const f = new FormData(e.currentTarget);
    const v = (k: string) => String(f.get(k) ?? "");
    setBusy(true);
    const res = await saveAuthoritySettingsAction({
      authorityName: v("authorityName"),
      endorsementWording: v("endorsementWording"),
      passMarkPercent: v("passMarkPercent"),
      resultValidityMonths: v("resultValidityMonths"),
      attemptLimit: v("attemptLimit"),
    });
    setBusy(false);
    setErrors(res.ok ? {} : (res.fieldErrors ?? {}));
    setMessage(res.ok ? "Settings saved." : res.message);
    if (res.ok) router.refresh();
  }
  const field = (name: keyof AuthoritySettings, label: string, input: React.ReactNode) => (
    <div>
      <label htmlFor={name} className="field-label">
        {label}
      </label>
      {input}
      {errors[name] && (
        <p id={`${name}-error`} className="field-error">
          {errors[name][0]}
        </p>
      )}
    </div>
  );
  const aria = (name: string) => (errors[name] ? { "aria-invalid": true, "aria-describedby": `${name}-error` } : {});
  const num = (name: keyof AuthoritySettings, min: number, max: number) => (
    <input
      id={name}
      name={name}
      type="number"
      min={min}
      max={max}
      inputMode="numeric"
      className="field-input num"
      defaultValue={settings[name]}
      {...aria(name)}
    />
  );

  return (
    <form className="card space-y-3" aria-label="Authority settings" noValidate onSubmit={save}>
      {field(
        "authorityName",
        "Authority",
        <input
          id="authorityName"
          name="authorityName"
          className="field-input"
          maxLength={100}
          defaultValue={settings.authorityName}
          {...aria("authorityName")}
        />,
      )}
      {field(
        "endorsementWording",
        "Endorsement wording",
        <textarea
          id="endorsementWording"
          name="endorsementWording"
          rows={4}
          className="field-input"
          maxLength={4000}
          defaultValue={settings.endorsementWording}
          {...aria("endorsementWording")}
        />,
      )}
      <div className="grid gap-3 sm:grid-cols-3">
        {field("passMarkPercent", "Pass mark (%)", num("passMarkPercent", 1, 100))}
        {field("resultValidityMonths", "A pass counts for (months)", num("resultValidityMonths", 1, 120))}
        {field("attemptLimit", "Attempts allowed", num("attemptLimit", 1, 20))}
      </div>
      <button type="submit" className="btn-primary" disabled={busy}>
        Save the settings
      </button>
      <div aria-live="polite">
        {message && (
          <p className="text-ink-soft" data-testid="settings-message">
            {message}
          </p>
        )}
      </div>
    </form>
  );
}
