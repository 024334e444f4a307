"use client";
import { useState, useTransition } from "react";
import { useQuery, useQueryClient } from "@tanstack/react-query";
import { walkIsLive, walkWords, type WalkView } from "@/lib/records/audit-walk-view";
import { startWalkAction } from "../actions";

const KEY = ["register", "walks", "latest"];

async function fetchLatest(): Promise<WalkView | null> {
  const res = await fetch("/api/register/walks/latest", { headers: { accept: "application/json" }, cache: "no-store" });
  if (!res.ok) throw new Error(`latest walk: ${res.status}`);
  return ((await res.json()) as { walk: WalkView | null }).walk;
}

/** The latest full walk of the chain, a button to ask for one, and its progress while it runs. */
export function FullWalk({ initial, timeZone }: { initial: WalkView | null; timeZone: string }) {
  const client = useQueryClient();
  const [error, setError] = useState<string | null>(null);
  const [pending, start] = useTransition();
  const { data: walk, isError } = useQuery({
    queryKey: KEY,
    queryFn: fetchLatest,
    initialData: initial,
    refetchInterval: (q) => (walkIsLive(q.state.data ?? null) ? 1500 : false),
  });
  const live = walkIsLive(walk);
  const words = walk ? walkWords(walk, timeZone) : null;
  return (
    <section
      className={`card border-l-4 ${walk?.state === "broken" || walk?.state === "failed" ? "border-l-notyet-600" : walk?.state === "ok" ? "border-l-solid-600" : "border-l-paper-edge"}`}
      aria-labelledby="full-walk"
      data-testid="full-walk"
      data-state={walk?.state ?? "none"}
    >
      <h2 id="full-walk">Full walk of the chain</h2>
      <p className="text-ink-soft">
        A full walk checks every event from position 1, not only those since the checkpoint. It runs in the background: you may leave this
        page and come back.
      </p>
      <div aria-live="polite" className="mt-2" data-testid="walk-status">
        {words ? (
          <>
            <h3 className="font-semibold">{words.heading}</h3>
            {words.lines.map((l) => (
              <p key={l}>{l}</p>
            ))}
            {live && walk && (
              <progress className="mt-1 w-full" max={Math.max(walk.total, 1)} value={walk.checked} aria-label="Events checked" />
            )}
          </>
        ) : (
          <p>No full walk has been made yet.</p>
        )}
      </div>
      {isError && (
        <p role="alert" className="mt-2 text-notyet-800">
          The progress could not be read just now; it is tried again shortly.
        </p>
      )}
      <button
        type="button"
        className="btn-primary mt-3"
        disabled={pending || live}
        onClick={() =>
          start(async () => {
            setError(null);
            const r = await startWalkAction({});
            if (r.ok) client.setQueryData(KEY, r.data.walk);
            else setError(r.message);
          })
        }
      >
        {live ? "Walk under way" : "Walk the whole chain now"}
      </button>
      {error && (
        <p role="alert" className="field-error">
          {error}
        </p>
      )}
    </section>
  );
}
