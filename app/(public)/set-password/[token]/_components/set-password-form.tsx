"use client";
import Link from "next/link";
import { useState } from "react";
import { setPasswordAction } from "../actions";

export function SetPasswordForm({ token }: { token: string }) {
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const [message, setMessage] = useState<string | null>(null);
  const [done, setDone] = useState(false);
  const [busy, setBusy] = useState(false);

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = new FormData(e.currentTarget);
    setBusy(true);
    setErrors({});
    setMessage(null);
    const res = await setPasswordAction({
      token,
      password: String(form.get("password") ?? ""),
      confirm: String(form.get("confirm") ?? ""),
    });
    setBusy(false);
    if (res.ok) {
      setDone(true);
      return;
    }
    setErrors(res.fieldErrors ?? {});
    setMessage(res.fieldErrors?.token?.[0] ?? null);
  }

  if (done) {
    return (
      <div className="rounded-card bg-board-800 p-5" role="status" data-testid="set-password-done">
        <p className="mb-4 text-chalk">Your password is set.</p>
        <Link href="/sign-in" className="btn inline-flex bg-chalk text-board-900 hover:bg-white">
          Sign in
        </Link>
      </div>
    );
  }

  const field = (id: "password" | "confirm", label: string, autoComplete: string) => (
    <div>
      <label htmlFor={id} className="block text-caption font-semibold text-chalk-dim">
        {label}
      </label>
      <input
        id={id}
        name={id}
        type="password"
        autoComplete={autoComplete}
        required
        aria-invalid={errors[id] ? true : undefined}
        aria-describedby={errors[id] ? `${id}-error` : undefined}
        className="mt-1 block w-full min-h-touch rounded-md border border-board-600 bg-board-950 px-3 text-chalk"
      />
      {errors[id] && (
        <p id={`${id}-error`} className="mt-1 text-caption font-semibold text-notyet-100">
          {errors[id][0]}
        </p>
      )}
    </div>
  );

  return (
    <form onSubmit={onSubmit} className="space-y-4 rounded-card bg-board-800 p-5" noValidate>
      {field("password", "New password", "new-password")}
      {field("confirm", "The same password again", "new-password")}
      <div aria-live="polite" className="min-h-6">
        {message && (
          <p role="alert" className="rounded-md bg-notyet-100 px-3 py-2 text-caption font-semibold text-notyet-800">
            {message}
          </p>
        )}
      </div>
      <button type="submit" disabled={busy} className="btn w-full bg-chalk text-board-900 hover:bg-white">
        {busy ? "Saving…" : "Set password"}
      </button>
    </form>
  );
}
