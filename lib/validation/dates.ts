import { z } from "zod";

// The one place that decides what a date or a time from outside is. Every schema with a
// calendar date, a wall-clock time or an instant uses these, so `2026-02-30` (which
// JavaScript quietly turns into March 2), `2026-13-01`, year 0000 (PostgreSQL has no year 0)
// and year 9999 are refused with a 400 naming the field instead of being shifted or reaching
// the database. The range is wide enough for any training record and narrow enough that
// nothing outside it can be a typing slip that still parses.

export const EARLIEST_YEAR = 1950;
export const LATEST_YEAR = 2100;

const DATE_RE = /^(\d{4})-(\d{2})-(\d{2})$/;
const TIME_RE = /^([01]\d|2[0-3]):([0-5]\d)$/;
// yyyy-mm-ddThh:mm, optional seconds and fraction, optional Z or ±hh:mm.
const INSTANT_RE = /^(\d{4}-\d{2}-\d{2})[T ]([01]\d|2[0-3]):([0-5]\d)(?::([0-5]\d)(?:\.\d{1,9})?)?(Z|[+-](?:[01]\d|2[0-3]):?[0-5]\d)?$/;

/** Whether `yyyy-mm-dd` names a day that exists, within the accepted years. Pure, no time zone. */
export function isCalendarDate(s: string): boolean {
  const m = DATE_RE.exec(s);
  if (!m) return false;
  const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
  if (y < EARLIEST_YEAR || y > LATEST_YEAR || mo < 1 || mo > 12 || d < 1) return false;
  const daysInMonth = new Date(Date.UTC(y, mo, 0)).getUTCDate();
  return d <= daysInMonth;
}

function dateProblem(s: string): string | null {
  const m = DATE_RE.exec(s);
  if (!m) return "a date as yyyy-mm-dd";
  const y = Number(m[1]);
  if (y < EARLIEST_YEAR || y > LATEST_YEAR) return `a year from ${EARLIEST_YEAR} to ${LATEST_YEAR}`;
  return isCalendarDate(s) ? null : "not a real calendar date";
}

/**
 * A calendar date `yyyy-mm-dd` that exists (no February 30, no month 13), years 1950..2100.
 * `required` is the message for an empty field (a form's "Choose a date").
 */
export function calendarDate(opts: { required?: string } = {}) {
  return z.string("a date as yyyy-mm-dd").superRefine((s, ctx) => {
    const problem = s === "" && opts.required ? opts.required : dateProblem(s);
    if (problem) ctx.addIssue({ code: "custom", message: problem });
  });
}

/** A wall-clock time `hh:mm`, 24-hour. */
export function wallClockTime(message = "a time as hh:mm (24-hour)") {
  return z.string(message).regex(TIME_RE, message);
}

/**
 * An instant: an ISO date and time (`yyyy-mm-ddThh:mm[:ss[.fff]][Z|±hh:mm]`) whose date part is
 * a real calendar date in range, or a Date object in range. Parsed as `new Date(...)` did before
 * (no offset = the server's local time), so accepted values mean what they meant.
 */
export function dateTime(message = "a date and time as yyyy-mm-ddThh:mm") {
  return z.union([z.string(), z.date()], message).transform((v, ctx) => {
    let d: Date;
    if (typeof v === "string") {
      const m = INSTANT_RE.exec(v.trim());
      const problem = m ? dateProblem(m[1]!) : message;
      if (problem) {
        ctx.addIssue({ code: "custom", message: problem === "a date as yyyy-mm-dd" ? message : problem });
        return z.NEVER;
      }
      d = new Date(v.trim());
    } else {
      d = v;
    }
    const y = d.getUTCFullYear();
    if (Number.isNaN(d.getTime()) || y < EARLIEST_YEAR || y > LATEST_YEAR) {
      ctx.addIssue({ code: "custom", message: Number.isNaN(d.getTime()) ? message : `a year from ${EARLIEST_YEAR} to ${LATEST_YEAR}` });
      return z.NEVER;
    }
    return d;
  });
}
