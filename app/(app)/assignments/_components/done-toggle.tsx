"use client";
import { useState, useTransition } from "react";
import { useRouter } from "next/navigation";
import { setAssignmentDoneAction } from "../actions";

export function DoneToggle({ assignmentId, done, title }: { assignmentId: string; done: boolean; title: string }) {
  const [pending, start] = useTransition();
  const [error, setError] = useState<string | null>(null);
  const router = useRouter();
  return (
    <span className="inline-flex flex-wrap items-center gap-2">
      <button
        type="button"
        className={done ? "btn-quiet" : "btn-primary"}
        disabled={pending}
        onClick={() =>
          start(async () => {
            const r = await setAssignmentDoneAction({ assignmentId, done: !done });
            setError(r.ok ? null : r.message);
            router.refresh();
          })
        }
      >
        {done ? "Not done yet" : "Mark done"}
        <span className="sr-only">: {title}</span>
      </button>
      {error && (
        <span role="alert" className="field-error">
          {error}
        </span>
      )}
    </span>
  );
}
