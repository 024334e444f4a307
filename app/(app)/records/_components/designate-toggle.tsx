"use client";
import { useState, useTransition } from "react";
import { useRouter } from "next/navigation";
import { designateCheckInstructorAction } from "../actions";

export function DesignateToggle({
  personId,
  name,
  designated,
  onChanged,
  showState = true,
}: {
  personId: string;
  name: string;
  designated: boolean;
  /** told the new state once it is saved */
  onChanged?: (designated: boolean) => void;
  /** say "Check instructor" / "Not designated" beside the button (not needed under a heading that says it) */
  showState?: boolean;
}) {
  const [pending, start] = useTransition();
  const [message, setMessage] = useState<string | null>(null);
  const router = useRouter();
  return (
    <span className="inline-flex items-center gap-2">
      {showState && <span className="text-caption font-semibold">{designated ? "Check instructor" : "Not designated"}</span>}
      <button
        type="button"
        className="btn-quiet"
        disabled={pending}
        aria-label={`${designated ? "Stop designating" : "Designate"} ${name} as check instructor`}
        onClick={() =>
          start(async () => {
            const r = await designateCheckInstructorAction({ personId, checkInstructor: !designated });
            setMessage(r.ok ? "Saved" : r.message);
            if (r.ok) onChanged?.(!designated);
            router.refresh();
          })
        }
      >
        {designated ? "Stop designating" : "Designate"}
      </button>
      <span aria-live="polite" className="text-caption">
        {message}
      </span>
    </span>
  );
}
