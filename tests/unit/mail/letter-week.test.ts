import { letterWindow, letterWeek } from "@/lib/mail/letter-week";

// The letter covers the seven days before the moment it is written and the seven after it, in the
// school's zone: a Friday letter reaches back to the previous Friday (so last Saturday and Sunday
// are in it) and forward to the next Friday (so tomorrow, Saturday, is in it).

const TZ = "Europe/London";

test("a Friday 17:30 letter covers Fri to Fri behind and Fri to Fri ahead, weekends included", () => {
  const at = new Date("2026-12-11T17:30:00Z"); // Friday, GMT
  const w = letterWindow(at, TZ);
  expect(w.pastFrom.toISOString()).toBe("2026-12-04T17:30:00.000Z");
  expect(w.nextTo.toISOString()).toBe("2026-12-18T17:30:00.000Z");
  expect([w.pastFirstDay, w.pastLastDay, w.nextFirstDay, w.nextLastDay]).toEqual(["2026-12-04", "2026-12-11", "2026-12-11", "2026-12-18"]);
  const saturdayAhead = new Date("2026-12-12T10:00:00Z");
  const saturdayBehind = new Date("2026-12-05T10:00:00Z");
  expect(saturdayAhead >= w.at && saturdayAhead < w.nextTo).toBe(true);
  expect(saturdayBehind >= w.pastFrom && saturdayBehind < w.at).toBe(true);
  // the letter week (Monday-based) still names the letter
  expect(letterWeek(at, TZ, 5)).toEqual({ weekStart: "2026-12-07", due: true });
});

test("consecutive letters leave no gap and no overlap", () => {
  const first = letterWindow(new Date("2026-12-11T17:30:00Z"), TZ);
  const second = letterWindow(new Date("2026-12-18T17:30:00Z"), TZ);
  expect(second.pastFrom.getTime()).toBe(first.at.getTime());
});

test("across the change of clocks the window keeps the local time of day (7 days, not 168 hours)", () => {
  // Friday 27 March 2026 18:00 GMT; clocks go forward on Sunday 29 March
  const w = letterWindow(new Date("2026-03-27T18:00:00Z"), TZ);
  expect(w.nextTo.toISOString()).toBe("2026-04-03T17:00:00.000Z"); // 18:00 BST
});
