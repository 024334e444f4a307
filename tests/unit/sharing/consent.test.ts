import { consentColumns, consentManager, isMinor, mayChangeConsent, NOTHING_SHARED, SHARE_CHOICES } from "@/lib/sharing/consent";

test("under 18 until the 18th birthday, adult from that day; no date of birth on file counts as adult", () => {
  expect(isMinor("2008-12-11", "2026-12-10")).toBe(true);
  expect(isMinor("2008-12-11", "2026-12-11")).toBe(false);
  expect(isMinor("2010-02-28", "2026-12-11")).toBe(true);
  expect(isMinor(null, "2026-12-11")).toBe(false);
});

test("an adult decides for themself; a minor's links are the school's, and the minor cannot withdraw them", () => {
  expect(consentManager(null, "2026-12-11")).toBe("student");
  expect(consentManager("2010-01-01", "2026-12-11")).toBe("school");
  expect(mayChangeConsent("student", { isTheStudent: true, staff: false })).toBe(true);
  expect(mayChangeConsent("student", { isTheStudent: false, staff: true })).toBe(false); // staff never override an adult
  expect(mayChangeConsent("school", { isTheStudent: true, staff: false })).toBe(false);
  expect(mayChangeConsent("school", { isTheStudent: false, staff: true })).toBe(true);
});

test("each choice maps to its own sponsor_links column; seeing and receiving mail are separate", () => {
  const cols = consentColumns({ ...NOTHING_SHARED, outcomes: true });
  expect(cols).toEqual({
    shares_attendance: false,
    shares_hours: false,
    shares_progress: false,
    shares_outcomes: true,
    shares_schedule: false,
    weekly_letter: false,
  });
  expect(new Set(SHARE_CHOICES.map((c) => c.column)).size).toBe(SHARE_CHOICES.length);
  expect(consentColumns({ ...NOTHING_SHARED, weeklyLetter: true }).weekly_letter).toBe(true);
});
