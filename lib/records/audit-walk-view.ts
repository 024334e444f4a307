import { formatDayTime } from "@/lib/time";

// The full walk of the audit chain as the chain page and its JSON show it (plain values, instants
// as ISO strings), and the words for it: what was checked, when, by whom asked, and the result.

export type WalkState = "queued" | "running" | "ok" | "broken" | "failed";

export interface WalkView {
  id: string;
  state: WalkState;
  requestedAt: string;
  requestedBy: string | null;
  startedAt: string | null;
  finishedAt: string | null;
  checked: number;
  total: number;
  broken: { position: number; id: string | null; problem: string } | null;
  failure: string | null;
}

interface WalkLike extends Omit<WalkView, "requestedAt" | "startedAt" | "finishedAt"> {
  requestedAt: Date;
  startedAt: Date | null;
  finishedAt: Date | null;
}

export function walkView(w: WalkLike): WalkView {
  return {
    ...w,
    requestedAt: w.requestedAt.toISOString(),
    startedAt: w.startedAt?.toISOString() ?? null,
    finishedAt: w.finishedAt?.toISOString() ?? null,
  };
}

export function walkIsLive(w: WalkView | null): boolean {
  return w !== null && (w.state === "queued" || w.state === "running");
}

const n = (x: number) => x.toLocaleString("en-GB");

/** A heading and sentences for a walk, times in the school's zone. */
export function walkWords(w: WalkView, timeZone: string): { heading: string; lines: string[] } {
  const asked = `Asked for by ${w.requestedBy ?? "an account no longer on file"} on ${formatDayTime(new Date(w.requestedAt), timeZone)}.`;
  const ended = w.finishedAt ? formatDayTime(new Date(w.finishedAt), timeZone, { seconds: true }) : "";
  switch (w.state) {
    case "queued":
      return { heading: "Full walk waiting to start", lines: [asked, `Checked ${n(0)} of ${n(w.total)} events.`] };
    case "running":
      return { heading: "Full walk under way", lines: [asked, `Checked ${n(w.checked)} of ${n(w.total)} events.`] };
    case "ok":
      return {
        heading: "Latest full walk: every link holds",
        lines: [
          `Finished ${ended}. Checked ${n(w.checked)} of ${n(w.total)} events, positions 1 to ${n(w.total)}: each event's hash was worked out again from the event and the hash before it, and matched.`,
          asked,
        ],
      };
    case "broken":
      return {
        heading: "Latest full walk: the chain is broken",
        lines: [
          `Finished ${ended}. Positions 1 to ${n(w.checked)} of ${n(w.total)} link up; the first broken link is at position ${n(w.broken?.position ?? w.checked + 1)}: ${w.broken?.problem ?? "no detail recorded"}.`,
          asked,
        ],
      };
    case "failed":
      return {
        heading: "Latest full walk could not be completed",
        lines: [
          `Stopped ${ended} after checking ${n(w.checked)} of ${n(w.total)} events: ${w.failure ?? "no reason recorded"}. No result: start the walk again.`,
          asked,
        ],
      };
  }
}
