import { dateInZone, formatInZone } from "@/lib/time";

// The Weekly letter's calendar (pure): which week a clock value falls in, in the school's zone,
// and whether that week's letter is due yet.

/** Local hour on the letter day from which the Weekly letter goes out. */
export const LETTER_HOUR = 17;

/** The calendar date `days` after `isoDate` (yyyy-MM-dd). */
export function addDays(isoDate: string, days: number): string {
  return new Date(Date.parse(`${isoDate}T12:00:00Z`) + days * 86_400_000).toISOString().slice(0, 10);
}

/** The Monday (yyyy-MM-dd) of the week holding `at` in the school's zone, and whether the letter is due. */
export function letterWeek(at: Date, timeZone: string, letterDay: number): { weekStart: string; due: boolean } {
  const today = dateInZone(at, timeZone);
  const isoDow = Number(formatInZone(at, timeZone, "i")); // 1 = Monday … 7 = Sunday
  const hour = Number(formatInZone(at, timeZone, "H"));
  const weekStart = addDays(today, -(isoDow - 1));
  const letterIdx = (letterDay + 6) % 7; // settings: 0 = Sunday … 6 = Saturday
  const todayIdx = isoDow - 1;
  const due = todayIdx > letterIdx || (todayIdx === letterIdx && hour >= LETTER_HOUR);
  return { weekStart, due };
}
