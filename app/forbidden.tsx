import Link from "next/link";

export default function Forbidden() {
  return (
    // forbidden() is only called for signed-in visitors, so this renders inside the app shell's <main>
    <div className="mx-auto max-w-xl px-4 py-10">
      <p className="text-caption font-semibold uppercase tracking-wide text-ink-soft">403 · Not allowed</p>
      <h1 className="mt-2 text-display">This page is not part of your role</h1>
      <p className="mt-3 text-ink-soft">Your account does not have access here. If you think it should, ask your chief instructor.</p>
      <p className="mt-6">
        <Link href="/today">Back to Today</Link>
      </p>
    </div>
  );
}
