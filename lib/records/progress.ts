import { dateInZone } from "@/lib/time";
import type { QuestionOutcome } from "./outcome";
import { ITEM_STATUS_WORDS } from "@/lib/labels";

// Pure rules of the Progress map: an item's status, and the outcomes counted per check date.

export type ItemStatus = "not_started" | "taught" | "checked" | "signed" | "stage_passed";
/** Words for the statuses: the one label map (lib/labels.ts). */
export const ITEM_STATUS_LABEL: Record<ItemStatus, string> = ITEM_STATUS_WORDS;

/**
 * A passed stage outranks a sign-off, which outranks an oral check in force, which outranks
 * teaching (a session covering the item that the student attended, late or leaving early).
 */
export function itemStatus(f: { stagePassed: boolean; signed: boolean; checked: boolean; taught?: boolean }): ItemStatus {
  if (f.stagePassed) return "stage_passed";
  if (f.signed) return "signed";
  if (f.checked) return "checked";
  if (f.taught) return "taught";
  return "not_started";
}

/** Per check date (school calendar, ascending): how many question outcomes of each kind. */
export function outcomesByDate(
  checks: { occurredAt: Date; questions: { outcome: QuestionOutcome }[] }[],
  timeZone: string,
): { date: string; solid: number; shaky: number; notYet: number }[] {
  const byDate = new Map<string, { solid: number; shaky: number; notYet: number }>();
  for (const c of [...checks].reverse()) {
    const d = dateInZone(c.occurredAt, timeZone);
    const e = byDate.get(d) ?? { solid: 0, shaky: 0, notYet: 0 };
    for (const q of c.questions) {
      if (q.outcome === "solid") e.solid++;
      else if (q.outcome === "shaky") e.shaky++;
      else e.notYet++;
    }
    byDate.set(d, e);
  }
  return [...byDate.entries()].sort(([a], [b]) => a.localeCompare(b)).map(([date, v]) => ({ date, ...v }));
}
