"use client";
import { useState } from "react";
import { useRouter } from "next/navigation";
import { duplicateAirframeAction, retireAirframeAction } from "../actions";

/** Duplicate and retire (or bring back) buttons on a profile page. */
export function AirframeButtons({ airframeId, retired }: { airframeId: string; retired: boolean }) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  // One idempotency key for the Duplicate button (renewed after a success): a retried click makes one copy.
  const [duplicateKey, setDuplicateKey] = useState(() => crypto.randomUUID());
  async function duplicate() {
    setBusy(true);
    const r = await duplicateAirframeAction({ airframeId, idempotencyKey: duplicateKey });
    setBusy(false);
    if (!r.ok) return setError(r.message);
    setDuplicateKey(crypto.randomUUID());
    router.push(`/curve-lab/airframes/${r.data.id}/edit`);
  }
  async function retire() {
    setBusy(true);
    const r = await retireAirframeAction({ airframeId, retired: !retired });
    setBusy(false);
    if (!r.ok) return setError(r.message);
    router.refresh();
  }
  return (
    <div className="flex flex-wrap items-center gap-2">
      {!retired && (
        <a href={`/curve-lab/airframes/${airframeId}/edit`} className="btn-quiet">
          Edit
        </a>
      )}
      <button type="button" className="btn-quiet" onClick={duplicate} disabled={busy}>
        Duplicate
      </button>
      <button type="button" className="btn-quiet" onClick={retire} disabled={busy}>
        {retired ? "Bring back" : "Retire"}
      </button>
      {!retired && (
        <a href={`/curve-lab/demos/new?airframe=${airframeId}`} className="btn-primary">
          Build a demo
        </a>
      )}
      <p aria-live="polite" className="field-error">
        {error}
      </p>
    </div>
  );
}
