/** Chalkwing's own mark: a chalk stroke drawn as a rising wing section. */
export function Wordmark({ className = "" }: { className?: string }) {
  return (
    <span className={`inline-flex items-center gap-2 font-bold tracking-tight ${className}`}>
      <svg width="28" height="20" viewBox="0 0 28 20" aria-hidden="true" focusable="false">
        <path d="M2 15 C 8 4, 18 2, 26 6 C 18 7, 10 11, 2 15 Z" fill="currentColor" opacity="0.9" />
        <path d="M4 18 L 24 18" stroke="currentColor" strokeWidth="2" strokeLinecap="round" opacity="0.5" />
      </svg>
      <span className="text-lead">Chalkwing</span>
    </span>
  );
}
