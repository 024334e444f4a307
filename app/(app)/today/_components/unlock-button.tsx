"use client";
import { useState, useTransition } from "react";
import { useRouter } from "next/navigation";
import { unlockAccountAction } from "../actions";

export function UnlockButton({ personId, name }: { personId: string; name: string }) {
  const [pending, start] = useTransition();
  const [message, setMessage] = useState<string | null>(null);
  const router = useRouter();
  return (
    <span className="inline-flex items-center gap-2">
      <button
        type="button"
        className="btn-quiet"
        disabled={pending}
        aria-label={`Unlock ${name}`}
        onClick={() =>
          start(async () => {
            const r = await unlockAccountAction({ personId });
            setMessage(r.ok ? "Unlocked" : r.message);
            router.refresh();
          })
        }
      >
        Unlock
      </button>
      <span aria-live="polite" className="text-caption">
        {message}
      </span>
    </span>
  );
}
