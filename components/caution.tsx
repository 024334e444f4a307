import { CAUTION_TEXT } from "@/lib/caution";

/** The caution's words (lib/caution.ts), also printed on exported charts and the training record PDF. */
export { CAUTION_TEXT };

/** The caution every screen that shows calculations carries. */
export function Caution({ className = "" }: { className?: string }) {
  return (
    <p className={`caution ${className}`} role="note" data-testid="caution">
      {CAUTION_TEXT}
    </p>
  );
}
