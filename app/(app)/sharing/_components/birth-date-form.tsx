"use client";
import { useState } from "react";
import { useRouter } from "next/navigation";
import { AGE_OF_MAJORITY } from "@/lib/sharing/consent";
import { formatDay } from "@/lib/time";
import { setBirthDateAction } from "../actions";

/**
 * The chief records a student's date of birth (or clears it). Under 18 the school manages the
 * student's sponsor links, so the page is refreshed to show who manages them now.
 */
export function BirthDateForm({ studentId, studentName, birthDate }: { studentId: string; studentName: string; birthDate: string | null }) {
  const router = useRouter();
  const [value, setValue] = useState(birthDate ?? "");
  const [error, setError] = useState<string | null>(null);
  const [status, setStatus] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function save(next: string) {
    setBusy(true);
    setError(null);
    setStatus(null);
    const res = await setBirthDateAction({ studentId, birthDate: next });
    setBusy(false);
    if (!res.ok) {
      const own = res.fieldErrors?.birthDate?.[0];
      if (res.field === "birthDate" || own) setError(own ?? res.message.replace(/^[^:]*:\s*/, ""));
      else setStatus(res.message);
      return;
    }
    setValue(res.data.birthDate ?? "");
    const who =
      res.data.manager === "school"
        ? `${studentName} is under ${AGE_OF_MAJORITY}: the school manages their sponsors.`
        : `${studentName} manages their own sponsors.`;
    setStatus(
      !res.data.changed
        ? "Nothing changed."
        : res.data.birthDate
          ? `Saved: born ${formatDay(res.data.birthDate)}. ${who}`
          : `Date of birth cleared. ${who}`,
    );
    router.refresh();
  }

  return (
    <form
      className="space-y-2"
      aria-label={`Date of birth of ${studentName}`}
      onSubmit={(e) => {
        e.preventDefault();
        void save(value);
      }}
    >
      <div>
        <label htmlFor="birthDate" className="field-label">
          Date of birth
        </label>
        <input
          id="birthDate"
          name="birthDate"
          type="date"
          className="field-input"
          value={value}
          onChange={(e) => setValue(e.target.value)}
          aria-invalid={!!error}
          aria-describedby={error ? "birthDate-error birthDate-hint" : "birthDate-hint"}
        />
        <p id="birthDate-hint" className="text-caption text-ink-soft">
          Under {AGE_OF_MAJORITY}, the school decides what {studentName}&apos;s sponsors see; from {AGE_OF_MAJORITY}, {studentName} does.
        </p>
        {error && (
          <p id="birthDate-error" className="field-error">
            Date of birth: {error}
          </p>
        )}
      </div>
      <div className="flex flex-wrap gap-2">
        <button type="submit" className="btn-primary" disabled={busy}>
          Save date of birth
        </button>
        {birthDate && (
          <button type="button" className="btn-quiet" disabled={busy} onClick={() => void save("")}>
            Clear it
          </button>
        )}
      </div>
      <p role="status" aria-live="polite" className="text-caption" data-testid="birth-date-status">
        {status}
      </p>
    </form>
  );
}
