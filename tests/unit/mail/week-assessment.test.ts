import { assessWeek, type WeekFacts } from "@/lib/mail/week-assessment";
import { composeWeeklyLetter } from "@/lib/mail/letter";

// The headline and the reasons come from one assessment: over every combination of the facts,
// "Behind" appears exactly when there are reasons, and a week with reasons is never called on track.

const values = { makeupsToBook: [0, 1, 3], missedSessions: [null, 0, 1, 2], lateAssignments: [0, 1, 4], milestones: [0, 1, 2] };
const combos: WeekFacts[] = [];
for (const makeupsToBook of values.makeupsToBook)
  for (const missedSessions of values.missedSessions)
    for (const lateAssignments of values.lateAssignments)
      for (const milestones of values.milestones) combos.push({ makeupsToBook, missedSessions, lateAssignments, milestones });

test.each(combos)("one verdict for %o", (f) => {
  const a = assessWeek(f);
  const expectedReasons = (f.makeupsToBook > 0 ? 1 : 0) + ((f.missedSessions ?? 0) > 0 ? 1 : 0) + (f.lateAssignments > 0 ? 1 : 0);
  expect(a.reasons).toHaveLength(expectedReasons);
  if (expectedReasons > 0) {
    expect(a.standing).toBe("behind");
    expect(a.headline).toMatch(/^Behind/);
    expect(a.headline).not.toMatch(/on track|strong|good/i);
    expect(a.headline).toContain(expectedReasons === 1 ? "one thing" : `${expectedReasons} things`);
  } else {
    expect(a.standing).toBe(f.milestones > 0 ? "good-week" : "on-track");
    expect(a.headline).toMatch(/^On track/);
    expect(a.headline).not.toMatch(/behind/i);
  }
});

test("the plain reasons count what they name", () => {
  expect(assessWeek({ makeupsToBook: 2, missedSessions: 1, lateAssignments: 3, milestones: 5 }).reasons).toEqual([
    "2 make-up items are still to be booked",
    "one session missed this week without an excuse",
    "3 assignments are past the due date and not done",
  ]);
  // missed sessions are no reason when attendance is not shared (null)
  expect(assessWeek({ makeupsToBook: 0, missedSessions: null, lateAssignments: 0, milestones: 0 }).reasons).toEqual([]);
});

test("the letter's progress section says the assessment's headline and nothing that disagrees with it", () => {
  const school = { name: "Larkhollow Flying School", timeZone: "Europe/London" };
  const base = {
    sponsorName: "Mara Quill",
    studentName: "Ada Quill",
    weekStart: "2026-12-07",
    unsubscribeUrl: "http://127.0.0.1:3000/unsubscribe/t",
    oneClickUrl: "http://127.0.0.1:3000/api/unsubscribe?token=t",
  };
  const behind = composeWeeklyLetter(
    {
      ...base,
      progress: {
        signedItems: [{ code: "AER-01", title: "Zero-lift drag" }],
        stagesPassed: [],
        makeupsToBook: [],
        lateAssignments: 1,
        missedSessions: null,
      },
    },
    school,
  );
  expect(behind.text).toContain("Behind: one thing needs catching up.");
  expect(behind.text).toContain("- one assignment is past the due date and not done");
  expect(behind.text).not.toMatch(/on track|strong week|good week/i);
  const fine = composeWeeklyLetter(
    {
      ...base,
      progress: {
        signedItems: [{ code: "AER-01", title: "Zero-lift drag" }],
        stagesPassed: [],
        makeupsToBook: [],
        lateAssignments: 0,
        missedSessions: 0,
      },
    },
    school,
  );
  expect(fine.text).toContain("On track, with one milestone this week.");
  expect(fine.text).not.toMatch(/behind/i);
});
