import {
  ageOn,
  birthDateProblem,
  consentColumns,
  consentManager,
  isMinor,
  mayChangeConsent,
  NOTHING_SHARED,
  SHARE_CHOICES,
} from "@/lib/sharing/consent";
import { birthDateSchema } from "@/lib/sharing/schema";

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

test("a date of birth is refused in the future or when the age it gives is implausible (common practice: 10 to 100)", () => {
  expect(ageOn("2008-12-11", "2026-12-10")).toBe(17);
  expect(ageOn("2008-12-11", "2026-12-11")).toBe(18);
  expect(ageOn("2008-02-29", "2026-02-28")).toBe(17);
  expect(birthDateProblem("2026-12-12", "2026-12-11")).toBe("must not be in the future");
  expect(birthDateProblem("2026-12-11", "2026-12-11")).toMatch(/age of 0, under 10/);
  expect(birthDateProblem("2016-12-12", "2026-12-11")).toMatch(/age of 9, under 10: check the year/);
  expect(birthDateProblem("2016-12-11", "2026-12-11")).toBeNull();
  expect(birthDateProblem("1925-12-12", "2026-12-11")).toBeNull(); // 100 until the day before the 101st birthday
  expect(birthDateProblem("1925-12-11", "2026-12-11")).toMatch(/age of 101, over 100: check the year/);
});

test("the form's schema takes a real calendar date from 1900 on, or empty to clear", () => {
  const id = "6f1c1c1e-1d7a-4a43-9b1c-2b9d2f7a9e11";
  expect(birthDateSchema.safeParse({ studentId: id, birthDate: "2001-02-28" }).success).toBe(true);
  expect(birthDateSchema.safeParse({ studentId: id, birthDate: "" }).success).toBe(true);
  for (const bad of ["2001-02-29", "2001-13-01", "1899-12-31", "01/02/2001", "2001-2-3"])
    expect(birthDateSchema.safeParse({ studentId: id, birthDate: bad }).success).toBe(false);
});
