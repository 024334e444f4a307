"use client";
import { useState } from "react";
import { resetCalendarTokenAction } from "../actions";

/** Makes or replaces the caller's secret calendar feed link; the link is shown once, right after. */
export function CalendarLink({ since }: { since: string | null }) {
  const [url, setUrl] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  async function reset() {
    setBusy(true);
    setError(null);
    const r = await resetCalendarTokenAction({});
    setBusy(false);
    if (r.ok) setUrl(new URL(r.data.path, window.location.origin).toString());
    else setError(r.message);
  }
  return (
    <section className="card" aria-labelledby="feed-title">
      <h2 id="feed-title">Your calendar feed</h2>
      <p className="mt-1 text-ink-soft">
        Subscribe to your sessions from a calendar program (iCalendar). The link is secret: anyone who has it sees your sessions.
        {since ? ` Your current link was made ${since}; a new one stops the old one at once.` : " You have no link yet."}
      </p>
      <button type="button" onClick={reset} disabled={busy} className="btn-quiet mt-3">
        {since || url ? "Replace my calendar link" : "Make my calendar link"}
      </button>
      <div aria-live="polite">
        {url && (
          <p className="mt-3">
            <label htmlFor="feed-url" className="field-label">
              Your new link (shown only now)
            </label>
            <input
              id="feed-url"
              readOnly
              value={url}
              className="field-input font-mono text-caption"
              data-testid="feed-url"
              onFocus={(e) => e.currentTarget.select()}
            />
          </p>
        )}
        {error && (
          <p role="alert" className="field-error">
            {error}
          </p>
        )}
      </div>
    </section>
  );
}
