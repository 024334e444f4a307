import Link from "next/link";

export default function NotFound() {
  return (
    <main id="main" className="mx-auto max-w-xl px-4 py-16">
      <p className="text-caption font-semibold uppercase tracking-wide text-ink-soft">404 · Not found</p>
      <h1 className="mt-2 text-display">Nothing here</h1>
      <p className="mt-3 text-ink-soft">The address may be mistyped, or the record is not one you can see.</p>
      <p className="mt-6">
        <Link href="/today">Back to Today</Link>
      </p>
    </main>
  );
}
