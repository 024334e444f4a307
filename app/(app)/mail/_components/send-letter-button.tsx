"use client";
import { useRef, useState } from "react";
import { useRouter } from "next/navigation";
import { sendLetterNowAction } from "../actions";

/** One key per preview shown: a double click, or a retry, sends one letter. */
export function SendLetterButton({ sponsorId, studentId }: { sponsorId: string; studentId: string }) {
  const router = useRouter();
  const key = useRef(crypto.randomUUID());
  const [busy, setBusy] = useState(false);
  const [status, setStatus] = useState<string | null>(null);
  return (
    <div className="flex flex-wrap items-center gap-2">
      <button
        type="button"
        className="btn-primary"
        disabled={busy}
        onClick={async () => {
          setBusy(true);
          const res = await sendLetterNowAction({ sponsorId, studentId, idempotencyKey: key.current });
          setBusy(false);
          if (!res.ok) setStatus(res.message);
          else {
            setStatus(
              res.data.written
                ? "Sent to the outbox: the mail worker sends it within a minute."
                : `This week's letter for them is already written (${res.data.state}); nothing more was sent.`,
            );
            router.refresh();
          }
        }}
      >
        Send this letter now
      </button>
      <p role="status" aria-live="polite" className="text-caption" data-testid="send-status">
        {status}
      </p>
    </div>
  );
}
