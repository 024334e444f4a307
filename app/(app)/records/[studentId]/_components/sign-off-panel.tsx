"use client";
import { useState, useTransition } from "react";
import { useRouter } from "next/navigation";
import { signOffAction } from "../../actions";

/** Shows the statement, asks the signer to re-enter their password, and signs. */
export function SignOffPanel({
  studentId,
  itemId,
  itemCode,
  statement,
}: {
  studentId: string;
  itemId: string;
  itemCode: string;
  statement: string;
}) {
  const [open, setOpen] = useState(false);
  const [password, setPassword] = useState("");
  const [error, setError] = useState<string | null>(null);
  const [pending, start] = useTransition();
  const router = useRouter();
  if (!open) {
    return (
      <button type="button" className="btn-primary" onClick={() => setOpen(true)} data-testid={`sign-${itemCode}`}>
        Sign off {itemCode}
      </button>
    );
  }
  return (
    <form
      className="space-y-2 rounded-md border border-wing-500 bg-wing-50 p-3"
      aria-label={`Sign off ${itemCode}`}
      onSubmit={(e) => {
        e.preventDefault();
        start(async () => {
          setError(null);
          const r = await signOffAction({ studentId, itemId, password });
          if (r.ok) {
            setOpen(false);
            router.refresh();
          } else setError(r.message);
        });
      }}
    >
      <p className="font-semibold">Statement</p>
      <blockquote className="border-l-4 border-wing-600 pl-3" data-testid="statement">
        {statement}
      </blockquote>
      <div>
        <label htmlFor={`pw-${itemId}`} className="field-label">
          Re-enter your password to sign
        </label>
        <input
          id={`pw-${itemId}`}
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
      <div className="flex flex-wrap gap-2">
        <button type="submit" className="btn-primary" disabled={pending || password === ""}>
          {pending ? "Signing…" : "Sign"}
        </button>
        <button type="button" className="btn-quiet" onClick={() => setOpen(false)}>
          Cancel
        </button>
      </div>
    </form>
  );
}
