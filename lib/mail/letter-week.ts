import { TZDate } from "@date-fns/tz";
import { addDays as addCalendarDays } from "date-fns";
import { dateInZone, formatInZone } from "@/lib/time";

// The Weekly letter's calendar (pure): which week a clock value falls in, in the school's zone,
// whether that week's letter is due yet, and the window a letter covers.

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

/**
 * What one letter covers, from the moment it is written (`at`), so no day falls between two
 * letters and none is told twice: "this week" is the seven days before `at`, "the week ahead" the
 * seven days after it (same local time of day, so a change of clocks moves nothing). Dates are the
 * first and last calendar days of each part in the school's zone, for the words of the letter.
 */
export interface LetterWindow {
  pastFrom: Date;
  /** = the sending moment */
  at: Date;
  nextTo: Date;
  pastFirstDay: string;
  pastLastDay: string;
  nextFirstDay: string;
  nextLastDay: string;
}

export function letterWindow(at: Date, timeZone: string): LetterWindow {
  const day = dateInZone(at, timeZone);
  const shift = (days: number) => new Date(addCalendarDays(new TZDate(at.getTime(), timeZone), days).getTime());
  const pastFrom = shift(-7);
  const nextTo = shift(7);
  return {
    pastFrom,
    at,
    nextTo,
    pastFirstDay: dateInZone(pastFrom, timeZone),
    pastLastDay: day,
    nextFirstDay: day,
    nextLastDay: dateInZone(nextTo, timeZone),
  };
}
