import { formatDay } from "@/lib/time";

/** A calendar date ("yyyy-MM-dd") as "Fri 9 Oct 2026" (the one date style of lib/time.ts). */
export function formatDueOn(dueOn: string): string {
  return formatDay(dueOn);
}
