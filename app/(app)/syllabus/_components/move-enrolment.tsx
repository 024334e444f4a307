"use client";
import { useState, useTransition } from "react";
import { useRouter } from "next/navigation";
import { moveEnrolmentAction } from "../actions";

export function MoveEnrolment({
  enrolmentId,
  studentName,
  currentRevisionId,
  revisions,
}: {
  enrolmentId: string;
  studentName: string;
  currentRevisionId: string;
  revisions: { id: string; number: number }[];
}) {
  const [revisionId, setRevisionId] = useState(currentRevisionId);
  const [message, setMessage] = useState<string | null>(null);
  const [pending, start] = useTransition();
  const router = useRouter();
  const id = `move-${enrolmentId}`;
  return (
    <form
      className="flex flex-wrap items-center gap-2"
      onSubmit={(e) => {
        e.preventDefault();
        start(async () => {
          const r = await moveEnrolmentAction({ enrolmentId, revisionId });
          setMessage(r.ok ? (r.data.moved ? `Moved to revision ${r.data.revisionNumber}` : "Already on that revision") : r.message);
          router.refresh();
        });
      }}
    >
      <label htmlFor={id} className="sr-only">
        Revision for {studentName}
      </label>
      <select id={id} className="field-input mt-0 w-auto" value={revisionId} onChange={(e) => setRevisionId(e.target.value)}>
        {revisions.map((r) => (
          <option key={r.id} value={r.id}>
            Revision {r.number}
          </option>
        ))}
      </select>
      <button type="submit" className="btn-quiet" disabled={pending || revisionId === currentRevisionId}>
        Move<span className="sr-only"> {studentName}</span>
      </button>
      <span aria-live="polite" className="text-caption">
        {message}
      </span>
    </form>
  );
}
