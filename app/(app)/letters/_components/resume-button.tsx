"use client";
import { useState } from "react";
import { useRouter } from "next/navigation";
import { resumeLetterAction } from "../actions";

export function ResumeLetterButton({ studentId, studentName }: { studentId: string; studentName: string }) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const [status, setStatus] = useState<string | null>(null);
  return (
    <span className="inline-flex flex-wrap items-center gap-2">
      <button
        type="button"
        className="btn-quiet"
        disabled={busy}
        onClick={async () => {
          setBusy(true);
          const res = await resumeLetterAction({ studentId });
          setBusy(false);
          if (res.ok) {
            setStatus("The Weekly letter is on again.");
            router.refresh();
          } else setStatus(res.message);
        }}
      >
        Receive the Weekly letter about {studentName} again
      </button>
      {/* inside the sponsor's letter line, which is itself the live region */}
      <span className="text-caption">{status}</span>
    </span>
  );
}
