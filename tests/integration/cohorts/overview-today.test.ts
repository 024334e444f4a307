// The Cohorts page names each cohort's students "today": the school's date in its own time zone by
// the app's clock (lib/clock), as every dated membership is read elsewhere, not the database
// server's date. The test school is in Europe/London and its students joined on 2026-09-01.
import { cohortsOverview } from "@/db/access/cohorts/cohorts-overview";
import { makeSchool, closeDb } from "@/tests/helpers/factories";
import { fixedClock, resetClock } from "@/lib/clock";

afterAll(async () => {
  resetClock();
  await closeDb();
});

async function countsOn(s: Awaited<ReturnType<typeof makeSchool>>, instant: string) {
  fixedClock(new Date(instant));
  try {
    const { cohorts } = await cohortsOverview(s.as.chief);
    return Object.fromEntries(cohorts.map((c) => [c.id, c.memberCount]));
  } finally {
    resetClock();
  }
}

it("counts the members of the school's today, by the app's clock and the school's time zone", async () => {
  const s = await makeSchool("cohorts-today");
  const a = s.cohorts.a.id;
  // 2026-08-31 23:30 UTC is already 1 September in London (summer time): the students have joined
  expect((await countsOn(s, "2026-08-31T23:30:00Z"))[a]).toBe(3);
  // 22:30 UTC is still 31 August in London: not yet
  expect((await countsOn(s, "2026-08-31T22:30:00Z"))[a]).toBe(0);
  // long before: nobody; and the members listed follow the count
  fixedClock(new Date("2026-01-15T12:00:00Z"));
  try {
    const { cohorts } = await cohortsOverview(s.as.chief);
    expect(cohorts.find((c) => c.id === a)?.members).toEqual([]);
  } finally {
    resetClock();
  }
});
