/** Done, overdue or due: said in words (with an icon) so colour is never the only sign. */
export function StatusBadge({ done, overdue }: { done: boolean; overdue: boolean }) {
  if (done)
    return (
      <span className="inline-flex items-center gap-1 rounded bg-solid-100 px-2 py-0.5 text-caption font-semibold text-solid-800">
        <span aria-hidden="true">✓</span> Done
      </span>
    );
  if (overdue)
    return (
      <span className="inline-flex items-center gap-1 rounded bg-notyet-100 px-2 py-0.5 text-caption font-semibold text-notyet-800">
        <span aria-hidden="true">!</span> Overdue
      </span>
    );
  return (
    <span className="inline-flex items-center gap-1 rounded bg-paper-deep px-2 py-0.5 text-caption font-semibold text-ink-soft">To do</span>
  );
}
