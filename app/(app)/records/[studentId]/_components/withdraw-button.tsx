"use client";
import { useState, useTransition } from "react";
import { useRouter } from "next/navigation";
import { withdrawCheckAction, withdrawSignOffAction } from "../../actions";

/** Withdraws a check or a sign-off with a reason; the original stays visible. */
export function WithdrawButton({ kind, id, label }: { kind: "check" | "signOff"; id: string; label: string }) {
  const [open, setOpen] = useState(false);
  const [reason, setReason] = useState("");
  const [error, setError] = useState<string | null>(null);
  const [pending, start] = useTransition();
  const router = useRouter();
  if (!open)
    return (
      <button type="button" className="btn-quiet" onClick={() => setOpen(true)}>
        {label}
      </button>
    );
  return (
    <form
      className="space-y-2"
      onSubmit={(e) => {
        e.preventDefault();
        start(async () => {
          const r =
            kind === "check" ? await withdrawCheckAction({ checkId: id, reason }) : await withdrawSignOffAction({ signOffId: id, reason });
          if (r.ok) {
            setOpen(false);
            router.refresh();
          } else setError(r.message);
        });
      }}
    >
      <label htmlFor={`reason-${id}`} className="field-label">
        Reason for the withdrawal
      </label>
      <input
        id={`reason-${id}`}
        value={reason}
        onChange={(e) => setReason(e.target.value)}
        className="field-input"
        required
        minLength={3}
      />
      {error && (
        <p className="field-error" role="alert">
          {error}
        </p>
      )}
      <div className="flex gap-2">
        <button type="submit" className="btn-primary" disabled={pending}>
          Withdraw
        </button>
        <button type="button" className="btn-quiet" onClick={() => setOpen(false)}>
          Cancel
        </button>
      </div>
    </form>
  );
}
