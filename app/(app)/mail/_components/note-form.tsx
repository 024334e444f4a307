"use client";
import { useRef, useState } from "react";
import { ChoiceField } from "@/components/search-picker";
import type { PickerChoices } from "@/lib/directory/picker";
import { addSponsorNoteAction } from "../actions";

/** A note for a student's sponsors; the students are listed while few, else searched (purpose notes). */
export function NoteForm({ students }: { students: PickerChoices }) {
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const [status, setStatus] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const keyRef = useRef<string>(crypto.randomUUID());
  const formRef = useRef<HTMLFormElement>(null);

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const f = new FormData(e.currentTarget);
    setBusy(true);
    setStatus(null);
    const res = await addSponsorNoteAction({
      studentId: String(f.get("studentId") ?? ""),
      body: String(f.get("body") ?? ""),
      idempotencyKey: keyRef.current,
    });
    setBusy(false);
    if (res.ok) {
      setErrors({});
      setStatus("Note saved; the next Weekly letter carries it.");
      keyRef.current = crypto.randomUUID();
      formRef.current?.reset();
    } else {
      setErrors(res.fieldErrors ?? {});
      setStatus(res.message);
    }
  }

  return (
    <form ref={formRef} onSubmit={onSubmit} noValidate className="card space-y-4">
      <ChoiceField
        id="studentId"
        name="studentId"
        label="Student"
        emptyLabel="Choose a student"
        choices={students}
        endpoint="/api/directory/students"
        params={{ purpose: "notes" }}
        error={errors.studentId?.[0]}
      />
      <div>
        <label htmlFor="body" className="field-label">
          Note for the sponsors
        </label>
        <textarea
          id="body"
          name="body"
          rows={4}
          maxLength={2000}
          className="field-input py-2"
          aria-invalid={errors.body ? true : undefined}
          aria-describedby={errors.body ? "body-error" : undefined}
        />
        {errors.body && (
          <p id="body-error" className="field-error">
            {errors.body[0]}
          </p>
        )}
      </div>
      <div className="flex flex-wrap items-center gap-4">
        <button type="submit" disabled={busy} className="btn-primary">
          {busy ? "Saving…" : "Save note"}
        </button>
        <p aria-live="polite" role="status" data-testid="note-status">
          {status}
        </p>
      </div>
    </form>
  );
}
