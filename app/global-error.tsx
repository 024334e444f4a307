"use client";

export default function GlobalError({ reset }: { error: Error; reset: () => void }) {
  return (
    <html lang="en-GB">
      <body>
        <main style={{ fontFamily: "system-ui", padding: "4rem 1rem", maxWidth: 560, margin: "0 auto" }}>
          <h1>Something went wrong</h1>
          <p>Chalkwing could not show this page. Try again in a moment.</p>
          <button type="button" onClick={reset}>
            Try again
          </button>
        </main>
      </body>
    </html>
  );
}
