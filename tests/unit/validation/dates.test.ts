import { z } from "zod";
import { calendarDate, dateTime, isCalendarDate, wallClockTime } from "@/lib/validation/dates";

const issue = (schema: z.ZodType, v: unknown) => {
  const r = z.object({ when: schema }).safeParse({ when: v });
  return r.success ? null : `${r.error.issues[0]!.path.join(".")}: ${r.error.issues[0]!.message}`;
};

describe("calendarDate", () => {
  test.each(["2026-02-28", "2028-02-29", "2026-12-31", "1950-01-01", "2100-12-31"])("accepts %s", (v) => {
    expect(issue(calendarDate(), v)).toBeNull();
  });
  test.each([
    ["2026-02-30", "when: not a real calendar date"],
    ["2026-02-29", "when: not a real calendar date"],
    ["2026-04-31", "when: not a real calendar date"],
    ["2026-13-01", "when: not a real calendar date"],
    ["2026-00-10", "when: not a real calendar date"],
    ["2026-01-00", "when: not a real calendar date"],
    ["0000-01-01", "when: a year from 1950 to 2100"],
    ["9999-12-31", "when: a year from 1950 to 2100"],
    ["2026-1-1", "when: a date as yyyy-mm-dd"],
    ["2026-01-01T00:00", "when: a date as yyyy-mm-dd"],
    [20260101, "when: a date as yyyy-mm-dd"],
  ])("refuses %p naming the field", (v, message) => {
    expect(issue(calendarDate(), v)).toBe(message);
  });
  test("an empty field gets the form's own message when one is given", () => {
    expect(issue(calendarDate({ required: "Choose a date" }), "")).toBe("when: Choose a date");
    expect(issue(calendarDate(), "")).toBe("when: a date as yyyy-mm-dd");
  });
  test("isCalendarDate agrees", () => {
    expect(isCalendarDate("2024-02-29")).toBe(true);
    expect(isCalendarDate("2100-02-29")).toBe(false); // 2100 is not a leap year (Gregorian century rule)
  });
});

describe("wallClockTime", () => {
  test("accepts 00:00 and 23:59, refuses 24:00 and 9:00", () => {
    expect(issue(wallClockTime(), "00:00")).toBeNull();
    expect(issue(wallClockTime(), "23:59")).toBeNull();
    expect(issue(wallClockTime(), "24:00")).toBe("when: a time as hh:mm (24-hour)");
    expect(issue(wallClockTime(), "9:00")).toBe("when: a time as hh:mm (24-hour)");
  });
});

describe("dateTime", () => {
  test("an ISO instant keeps its meaning", () => {
    const r = z.object({ when: dateTime() }).parse({ when: "2026-11-02T09:30:00.000Z" });
    expect(r.when.toISOString()).toBe("2026-11-02T09:30:00.000Z");
    expect(z.object({ when: dateTime() }).parse({ when: "2026-11-02T09:30:00+02:00" }).when.toISOString()).toBe("2026-11-02T07:30:00.000Z");
  });
  test("a Date object in range passes through", () => {
    const d = new Date("2026-05-05T10:00:00Z");
    expect(z.object({ when: dateTime() }).parse({ when: d }).when).toEqual(d);
  });
  test.each([
    ["2026-02-30T10:00", "when: not a real calendar date"],
    ["2026-13-01T10:00Z", "when: not a real calendar date"],
    ["0000-01-01T00:00Z", "when: a year from 1950 to 2100"],
    ["9999-12-31T23:59Z", "when: a year from 1950 to 2100"],
    ["2026-11-02T25:00Z", "when: a date and time as yyyy-mm-ddThh:mm"],
    ["next tuesday", "when: a date and time as yyyy-mm-ddThh:mm"],
    ["1234", "when: a date and time as yyyy-mm-ddThh:mm"],
  ])("refuses %p naming the field", (v, message) => {
    expect(issue(dateTime(), v)).toBe(message);
  });
  test("refuses a Date object outside the years and an invalid Date", () => {
    expect(issue(dateTime(), new Date(Date.UTC(9999, 0, 1)))).toBe("when: a year from 1950 to 2100");
    expect(issue(dateTime(), new Date("nonsense"))).toBe("when: a date and time as yyyy-mm-ddThh:mm");
  });
});
