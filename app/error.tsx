"use client";

export default function RootError({ reset }: { error: Error; reset: () => void }) {
  return (
    <main id="main" className="mx-auto max-w-xl px-4 py-16">
      <h1 className="text-display">Something went wrong</h1>
      <p className="mt-3 text-ink-soft">The page could not be shown. Try again in a moment.</p>
      <button type="button" className="btn-primary mt-6" onClick={reset}>
        Try again
      </button>
    </main>
  );
}
