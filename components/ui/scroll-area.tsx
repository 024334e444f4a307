/**
 * A horizontally scrolling wrapper for wide tables on narrow screens. It is a named region that
 * takes keyboard focus, so keyboard users can scroll it with the arrow keys (axe rule
 * scrollable-region-focusable). Use it instead of a bare `<div className="overflow-x-auto">`.
 * It is `relative` so that absolutely positioned content inside (e.g. `sr-only` text in a cell) is
 * clipped with the table instead of widening the page.
 */
export function ScrollArea({ label, className = "", children }: { label: string; className?: string; children: React.ReactNode }) {
  return (
    <div role="region" aria-label={label} tabIndex={0} className={`relative overflow-x-auto ${className}`}>
      {children}
    </div>
  );
}
