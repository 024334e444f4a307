/** The caution's words, also printed on exported charts. */
export const CAUTION_TEXT =
  "For ground teaching only: not for flight planning or operation. The aircraft's flight manual, local regulations and licensed instructors prevail.";

/** The caution every screen that shows calculations carries. */
export function Caution({ className = "" }: { className?: string }) {
  return (
    <p className={`caution ${className}`} role="note" data-testid="caution">
      {CAUTION_TEXT}
    </p>
  );
}
