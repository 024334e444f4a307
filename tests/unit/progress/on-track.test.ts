import { assessOnTrack, paceMinutes, type OnTrackFacts } from "@/lib/progress/on-track";

// A 35 h course (2,100 minutes), enrolled on 1 Sep 2026, planned end 30 Nov 2026 (90 days).
const base: OnTrackFacts = {
  today: "2026-10-16", // 45 of 90 days gone: half the minimum, 1,050 minutes, is due
  creditedMinutes: 1_200,
  minGroundMinutes: 2_100,
  enrolledOn: "2026-09-01",
  plannedEndOn: "2026-11-30",
  nextStage: { code: "S2", title: "Aerodynamics", itemsLeft: 3 },
  openMakeups: 0,
  weakItems: [],
};

describe("paceMinutes", () => {
  it("pro-rates the minimum on a straight line from enrolment to planned end", () => {
    expect(paceMinutes(2_100, "2026-09-01", "2026-11-30", "2026-10-16")).toBe(1_050);
    expect(paceMinutes(2_100, "2026-09-01", "2026-11-30", "2026-09-01")).toBe(0);
  });
  it("never asks more than the minimum after the planned end, nor less than nothing before enrolment", () => {
    expect(paceMinutes(2_100, "2026-09-01", "2026-11-30", "2027-02-01")).toBe(2_100);
    expect(paceMinutes(2_100, "2026-09-01", "2026-11-30", "2026-08-01")).toBe(0);
  });
});

describe("assessOnTrack", () => {
  it("is on track with hours ahead of the pace, no make-ups and no weak items, and says why in one line", () => {
    const a = assessOnTrack(base);
    expect(a.standing).toBe("on-track");
    expect(a.neededMinutes).toBe(1_050);
    expect(a.line).toBe(
      "On track: 20 h credited, 17.5 h needed by now to finish by Mon 30 Nov 2026; 3 items left before the S2 stage check.",
    );
    expect(a.reasons).toEqual([]);
  });

  it("is behind when the credited hours fall short of the pace, naming both figures", () => {
    const a = assessOnTrack({ ...base, creditedMinutes: 900 });
    expect(a.standing).toBe("behind");
    expect(a.line).toBe(
      "Behind: 15 h credited, the pace to finish by Mon 30 Nov 2026 needs 17.5 h by now; 3 items left before the S2 stage check.",
    );
  });

  it("is behind with open make-ups and weak items even when the hours are on pace", () => {
    const a = assessOnTrack({
      ...base,
      openMakeups: 2,
      nextStage: { code: "S2", title: "Aerodynamics", itemsLeft: 1 },
      weakItems: [
        { code: "PF-3", outcome: "not_yet" },
        { code: "PF-4", outcome: "shaky" },
        { code: "PF-5", outcome: "shaky" },
      ],
    });
    expect(a.standing).toBe("behind");
    expect(a.reasons).toEqual(["2 make-ups open", "PF-3 last marked Not yet", "PF-4, PF-5 last marked Shaky"]);
    expect(a.line).toBe(
      "Behind: 2 make-ups open; PF-3 last marked Not yet; PF-4, PF-5 last marked Shaky; 1 item left before the S2 stage check.",
    );
  });

  it("without a planned end says so instead of inventing a pace", () => {
    const a = assessOnTrack({ ...base, plannedEndOn: null, nextStage: null });
    expect(a.neededMinutes).toBeNull();
    expect(a.line).toBe("On track: 20 h credited (no planned end date, so no pace to compare with); every stage check passed.");
  });

  it("says when nothing is left to sign before the next stage check", () => {
    expect(assessOnTrack({ ...base, nextStage: { code: "S1", title: "x", itemsLeft: 0 } }).line).toContain(
      "nothing left to sign before the S1 stage check",
    );
  });
});
