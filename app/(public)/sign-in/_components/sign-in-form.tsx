"use client";
import { signIn } from "next-auth/react";
import { useState } from "react";
import { safeNextPath } from "@/lib/validation/next-path";

export function SignInForm({ next }: { next: string }) {
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function onSubmit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = new FormData(e.currentTarget);
    setBusy(true);
    setError(null);
    const res = await signIn("credentials", {
      email: String(form.get("email") ?? ""),
      password: String(form.get("password") ?? ""),
      redirect: false,
    });
    setBusy(false);
    if (!res || res.error) {
      setError("That e-mail and password do not match an active account, or the account is locked for a while.");
      return;
    }
    window.location.assign(safeNextPath(next));
  }

  return (
    <form onSubmit={onSubmit} className="space-y-4 rounded-card bg-board-800 p-5" noValidate>
      <div>
        <label htmlFor="email" className="block text-caption font-semibold text-chalk-dim">
          E-mail
        </label>
        <input
          id="email"
          name="email"
          type="email"
          autoComplete="username"
          required
          className="mt-1 block w-full min-h-touch rounded-md border border-board-600 bg-board-950 px-3 text-chalk"
        />
      </div>
      <div>
        <label htmlFor="password" className="block text-caption font-semibold text-chalk-dim">
          Password
        </label>
        <input
          id="password"
          name="password"
          type="password"
          autoComplete="current-password"
          required
          className="mt-1 block w-full min-h-touch rounded-md border border-board-600 bg-board-950 px-3 text-chalk"
        />
      </div>
      <div aria-live="polite" className="min-h-6">
        {error && (
          <p
            role="alert"
            data-testid="sign-in-error"
            className="rounded-md bg-notyet-100 px-3 py-2 text-caption font-semibold text-notyet-800"
          >
            {error}
          </p>
        )}
      </div>
      <button type="submit" disabled={busy} className="btn w-full bg-chalk text-board-900 hover:bg-white">
        {busy ? "Signing in…" : "Sign in"}
      </button>
    </form>
  );
}
