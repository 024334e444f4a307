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
