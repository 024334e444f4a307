"use client";
import { useState, useTransition } from "react";
import { useRouter } from "next/navigation";
import { reviewWatchNoteAction } from "../actions";

/** Marks one watch note reviewed with a remark; the review is appended, never removed. */
export function ReviewNote({
  note,
}: {
  note: { recordType: "sign_off" | "oral_check" | "stage_check"; recordId: string; kind: string; itemCode: string | null; label: string };
}) {
  const [open, setOpen] = useState(false);
  const [remark, setRemark] = useState("");
  const [error, setError] = useState<string | null>(null);
  const [pending, start] = useTransition();
  const router = useRouter();
  const id = `review-${note.recordId}-${note.kind}-${note.itemCode ?? ""}`;
  if (!open)
    return (
      <button type="button" className="btn-quiet ml-2" onClick={() => setOpen(true)}>
        Mark reviewed
      </button>
    );
  return (
    <form
      className="mt-1 flex flex-wrap items-end gap-2"
      aria-label={`Review the note ${note.label}`}
      onSubmit={(e) => {
        e.preventDefault();
        start(async () => {
          setError(null);
          const r = await reviewWatchNoteAction({ ...note, remark });
          if (r.ok) {
            setOpen(false);
            router.refresh();
          } else setError(r.message);
        });
      }}
    >
      <div>
        <label htmlFor={id} className="field-label">
          Remark
        </label>
        <input id={id} value={remark} onChange={(e) => setRemark(e.target.value)} className="field-input" required minLength={3} />
      </div>
      <button type="submit" className="btn-primary" disabled={pending}>
        Mark reviewed
      </button>
      <button type="button" className="btn-quiet" onClick={() => setOpen(false)}>
        Cancel
      </button>
      {error && (
        <p className="field-error" role="alert">
          {error}
        </p>
      )}
    </form>
  );
}
