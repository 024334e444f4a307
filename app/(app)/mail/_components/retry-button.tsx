"use client";
import { useState } from "react";
import { retryMailAction } from "../actions";

export function RetryButton({ outboxId }: { outboxId: string }) {
  const [msg, setMsg] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  return (
    <span className="inline-flex flex-wrap items-center gap-2">
      <button
        type="button"
        className="btn-quiet"
        disabled={busy}
        onClick={async () => {
          setBusy(true);
          const res = await retryMailAction({ outboxId });
          setBusy(false);
          setMsg(res.ok ? "Queued again" : res.message);
        }}
      >
        Send again
      </button>
      <span aria-live="polite" className="text-caption">
        {msg}
      </span>
    </span>
  );
}
