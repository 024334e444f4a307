"use client";
// The one pattern for wide tables on narrow screens: the columns that matter stay, the rest are
// marked `data-more` on their <th> and <td> and, below 768 px, wait behind a "More columns" button
// (aria-expanded, aria-controls). From 768 px every column shows. The table scrolls sideways in
// ScrollArea when even that is too wide. Columns a caller may not see are never rendered at all:
// the page leaves them out (permission checks on the server), this only decides what fits.
import { useId, useState } from "react";
import { ScrollArea } from "./scroll-area";

export function WideTable({ label, more, children }: { label: string; more: number; children: React.ReactNode }) {
  const [shown, setShown] = useState(false);
  const id = useId();
  return (
    <div className="wide-table" data-more-shown={shown ? "" : undefined}>
      {more > 0 && (
        <button
          type="button"
          aria-expanded={shown}
          aria-controls={id}
          onClick={() => setShown((s) => !s)}
          className="btn-quiet mb-2 min-h-10 text-caption md:hidden"
        >
          {shown ? "Fewer columns" : `More columns (${more})`}
        </button>
      )}
      <div id={id}>
        <ScrollArea label={label}>{children}</ScrollArea>
      </div>
    </div>
  );
}
