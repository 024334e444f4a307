/** The caution every screen that shows calculations carries. */
export function Caution({ className = "" }: { className?: string }) {
  return (
    <p className={`caution ${className}`} role="note" data-testid="caution">
      For ground teaching only: not for flight planning or operation. The aircraft&apos;s flight manual, local regulations and licensed
      instructors prevail.
    </p>
  );
}
