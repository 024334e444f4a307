"use client";
import { useState, useTransition } from "react";
import { useRouter } from "next/navigation";
import { acknowledgeCheckAction } from "../actions";

/** The student acknowledges the debrief (an acknowledgement that it was given, not consent to its content). */
export function AcknowledgeButton({ checkId }: { checkId: string }) {
  const [pending, start] = useTransition();
  const [message, setMessage] = useState<string | null>(null);
  const router = useRouter();
  return (
    <span className="mt-1 inline-flex flex-wrap items-center gap-2">
      <button
        type="button"
        className="btn-quiet"
        disabled={pending}
        onClick={() =>
          start(async () => {
            const r = await acknowledgeCheckAction({ checkId });
            setMessage(r.ok ? "Acknowledged" : r.message);
            router.refresh();
          })
        }
      >
        I have had the debrief
      </button>
      <span aria-live="polite" className="text-caption">
        {message}
      </span>
    </span>
  );
}
