"use client";
import { useState, useTransition } from "react";
import { useRouter } from "next/navigation";
import { withdrawCheckAction, withdrawSignOffAction } from "../../actions";

/**
 * Withdraws a check or a sign-off with a reason; the original stays visible. A correction of the
 * record is signed as a sign-off is: the withdrawer re-enters their password.
 */
export function WithdrawButton({ kind, id, label }: { kind: "check" | "signOff"; id: string; label: string }) {
  const [open, setOpen] = useState(false);
  const [reason, setReason] = useState("");
  const [password, setPassword] = useState("");
  const [error, setError] = useState<{ field: string | null; message: string } | null>(null);
  const [pending, start] = useTransition();
  const router = useRouter();
  if (!open)
    return (
      <button type="button" className="btn-quiet" onClick={() => setOpen(true)}>
        {label}
      </button>
    );
  const invalid = (field: string) => (error?.field === field ? true : undefined);
  return (
    <form
      className="space-y-2"
      aria-label={label}
      onSubmit={(e) => {
        e.preventDefault();
        start(async () => {
          const r =
            kind === "check"
              ? await withdrawCheckAction({ checkId: id, reason, password })
              : await withdrawSignOffAction({ signOffId: id, reason, password });
          if (r.ok) {
            setPassword("");
            setOpen(false);
            router.refresh();
          } else setError({ field: r.field ?? null, message: r.message });
        });
      }}
    >
      <div>
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
          aria-invalid={invalid("reason")}
        />
      </div>
      <div>
        <label htmlFor={`withdraw-pw-${id}`} className="field-label">
          Re-enter your password to sign the withdrawal
        </label>
        <input
          id={`withdraw-pw-${id}`}
          type="password"
          autoComplete="current-password"
          value={password}
          onChange={(e) => setPassword(e.target.value)}
          className="field-input"
          required
          aria-invalid={invalid("password")}
        />
      </div>
      {error && (
        <p className="field-error" role="alert">
          {error.message}
        </p>
      )}
      <div className="flex gap-2">
        <button type="submit" className="btn-primary" disabled={pending || password === ""}>
          Sign the withdrawal
        </button>
        <button type="button" className="btn-quiet" onClick={() => setOpen(false)}>
          Cancel
        </button>
      </div>
    </form>
  );
}
