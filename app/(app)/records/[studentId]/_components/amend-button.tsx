"use client";
import { useState, useTransition } from "react";
import { useRouter } from "next/navigation";
import { amendSignOffAction } from "../../actions";

/**
 * Amends a current sign-off: a new signed record on today's basis that refers to the original,
 * with a reason; the original stays visible in the register. The signer re-enters the password.
 */
export function AmendButton({ signOffId, itemCode }: { signOffId: string; itemCode: string }) {
  const [open, setOpen] = useState(false);
  const [reason, setReason] = useState("");
  const [signedOn, setSignedOn] = useState("");
  const [password, setPassword] = useState("");
  const [error, setError] = useState<string | null>(null);
  const [pending, start] = useTransition();
  const router = useRouter();
  if (!open)
    return (
      <button type="button" className="btn-quiet" onClick={() => setOpen(true)}>
        Amend sign-off of {itemCode}
      </button>
    );
  return (
    <form
      className="space-y-2 rounded-md border border-paper-edge p-2"
      aria-label={`Amend sign-off of ${itemCode}`}
      onSubmit={(e) => {
        e.preventDefault();
        start(async () => {
          const r = await amendSignOffAction({ signOffId, reason, password, ...(signedOn ? { signedOn } : {}) });
          if (r.ok) {
            setOpen(false);
            router.refresh();
          } else setError(r.message);
        });
      }}
    >
      <div>
        <label htmlFor={`amend-reason-${signOffId}`} className="field-label">
          Reason for the amendment
        </label>
        <input
          id={`amend-reason-${signOffId}`}
          value={reason}
          onChange={(e) => setReason(e.target.value)}
          className="field-input"
          required
          minLength={3}
        />
      </div>
      <div>
        <label htmlFor={`amend-date-${signOffId}`} className="field-label">
          Signed for (date; empty for today)
        </label>
        <input
          id={`amend-date-${signOffId}`}
          type="date"
          value={signedOn}
          onChange={(e) => setSignedOn(e.target.value)}
          className="field-input"
        />
      </div>
      <div>
        <label htmlFor={`amend-pw-${signOffId}`} className="field-label">
          Re-enter your password to sign
        </label>
        <input
          id={`amend-pw-${signOffId}`}
          type="password"
          autoComplete="current-password"
          value={password}
          onChange={(e) => setPassword(e.target.value)}
          className="field-input"
          required
        />
      </div>
      {error && (
        <p className="field-error" role="alert">
          {error}
        </p>
      )}
      <div className="flex gap-2">
        <button type="submit" className="btn-primary" disabled={pending}>
          Sign the amendment
        </button>
        <button type="button" className="btn-quiet" onClick={() => setOpen(false)}>
          Cancel
        </button>
      </div>
    </form>
  );
}
