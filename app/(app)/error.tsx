"use client";

export default function SignedInError({ reset }: { error: Error; reset: () => void }) {
  return (
    <div className="card max-w-xl">
      <h1>Something went wrong</h1>
      <p className="mt-2 text-ink-soft">
        The page could not be shown. Nothing you entered was half-saved. Try again, or come back in a moment.
      </p>
      <button type="button" className="btn-primary mt-4" onClick={reset}>
        Try again
      </button>
    </div>
  );
}
