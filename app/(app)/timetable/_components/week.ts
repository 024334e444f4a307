import { formatDay } from "@/lib/time";

/** Calendar-date arithmetic on "yyyy-MM-dd" strings (no time zone involved). */
export function addDaysIso(date: string, days: number): string {
  const d = new Date(`${date}T12:00:00Z`);
  d.setUTCDate(d.getUTCDate() + days);
  return d.toISOString().slice(0, 10);
}

/** The Monday of the week that holds `date`. */
export function mondayOf(date: string): string {
  const dow = new Date(`${date}T12:00:00Z`).getUTCDay(); // 0 = Sunday
  return addDaysIso(date, -((dow + 6) % 7));
}

/** A day of the week as "Thu 3 Dec 2026" (the one date style of lib/time.ts). */
export function dayLabel(date: string): string {
  return formatDay(date);
}
