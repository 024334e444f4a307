import { TZDate } from "@date-fns/tz";
import { format } from "date-fns";

/** Formats an instant as wall-clock time in a school's time zone. */
export function formatInZone(instant: Date, timeZone: string, pattern: string): string {
  return format(new TZDate(instant.getTime(), timeZone), pattern);
}

/** The calendar date ("yyyy-MM-dd") of an instant in a time zone. */
export function dateInZone(instant: Date, timeZone: string): string {
  return formatInZone(instant, timeZone, "yyyy-MM-dd");
}

/** The instant of a wall-clock time ("yyyy-MM-dd", "HH:mm") in a time zone. */
export function zonedInstant(date: string, time: string, timeZone: string): Date {
  const [y, m, d] = date.split("-").map(Number) as [number, number, number];
  const [hh, mm] = time.split(":").map(Number) as [number, number];
  return new Date(new TZDate(y, m - 1, d, hh, mm, 0, timeZone).getTime());
}

export function hoursLabel(minutes: number, minimumMinutes?: number): string {
  const h = (x: number) => (Math.round((x / 60) * 10) / 10).toLocaleString("en-GB", { maximumFractionDigits: 1 });
  return minimumMinutes === undefined ? `${h(minutes)} h` : `${h(minutes)} of ${h(minimumMinutes)} h`;
}

// The one date style of screens, mail and PDFs (CSV and iCalendar keep ISO dates):
// a day is "Thu 3 Dec 2026", a moment is "Thu 3 Dec 2026, 09:00", always in the school's time zone.
const DAY = "EEE d MMM yyyy";

/**
 * A day as people read it: "Thu 3 Dec 2026". A calendar date ("2026-12-03") is shown as that
 * date whatever the zone; an instant is shown as its date in the school's time zone.
 */
export function formatDay(value: Date | string, timeZone = "UTC"): string {
  if (typeof value === "string") {
    const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(value);
    if (!m) return value;
    return format(new Date(Number(m[1]), Number(m[2]) - 1, Number(m[3])), DAY);
  }
  return formatInZone(value, timeZone, DAY);
}

/** A moment as people read it: "Thu 3 Dec 2026, 09:00" (with seconds for audit trails). */
export function formatDayTime(instant: Date, timeZone: string, opts: { seconds?: boolean } = {}): string {
  return formatInZone(instant, timeZone, `${DAY}, ${opts.seconds ? "HH:mm:ss" : "HH:mm"}`);
}

/** A wall-clock time in the school's zone: "09:00". */
export function formatTime(instant: Date, timeZone: string): string {
  return formatInZone(instant, timeZone, "HH:mm");
}
