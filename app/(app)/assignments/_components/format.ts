import { format } from "date-fns";

/** A calendar date ("yyyy-MM-dd") as "Fri 9 Oct 2026"; the date is a date, not an instant, so no time zone applies. */
export function formatDueOn(dueOn: string): string {
  const [y, m, d] = dueOn.split("-").map(Number) as [number, number, number];
  return format(new Date(y, m - 1, d), "EEE d MMM yyyy");
}
