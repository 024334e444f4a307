import { walkIsLive, walkView, walkWords, type WalkView } from "@/lib/records/audit-walk-view";

const base: WalkView = {
  id: "0d6b7f0e-2c1a-4a57-9a3e-1f0a2b3c4d5e",
  state: "queued",
  requestedAt: "2026-12-03T09:15:00.000Z",
  requestedBy: "Chief Example",
  startedAt: null,
  finishedAt: null,
  checked: 0,
  total: 250000,
  broken: null,
  failure: null,
};

describe("the words for a full walk of the chain", () => {
  it("while it runs: who asked, when, and checked X of Y", () => {
    const w = walkWords({ ...base, state: "running", checked: 12500 }, "Europe/London");
    expect(w.heading).toBe("Full walk under way");
    expect(w.lines).toContain("Checked 12,500 of 250,000 events.");
    expect(w.lines.join(" ")).toMatch(/Asked for by Chief Example on .*09:15/);
    expect(walkIsLive({ ...base, state: "running" })).toBe(true);
    expect(walkIsLive({ ...base, state: "queued" })).toBe(true);
  });

  it("an ok walk says what was checked and when it finished, in the school's zone", () => {
    const w = walkWords({ ...base, state: "ok", checked: 250000, finishedAt: "2026-12-03T09:15:11.000Z" }, "America/New_York");
    expect(w.heading).toMatch(/every link holds/);
    expect(w.lines[0]).toMatch(/^Finished .*04:15:11\. Checked 250,000 of 250,000 events, positions 1 to 250,000/);
    expect(walkIsLive({ ...base, state: "ok" })).toBe(false);
  });

  it("a broken walk names the first broken link and how far the chain held", () => {
    const w = walkWords(
      {
        ...base,
        state: "broken",
        checked: 1399,
        finishedAt: "2026-12-03T09:16:00.000Z",
        broken: { position: 1400, id: null, problem: "row at position 1400 was changed after it was written" },
      },
      "Europe/London",
    );
    expect(w.heading).toMatch(/broken/);
    expect(w.lines[0]).toMatch(
      /Positions 1 to 1,399 of 250,000 link up; the first broken link is at position 1,400: row at position 1400 was changed after it was written\.$/,
    );
  });

  it("a walk that could not be completed gives no result and asks for a new walk", () => {
    const w = walkWords(
      { ...base, state: "failed", checked: 5000, finishedAt: "2026-12-03T09:16:00.000Z", failure: "connection lost" },
      "UTC",
    );
    expect(w.lines[0]).toMatch(/after checking 5,000 of 250,000 events: connection lost\. No result: start the walk again\.$/);
  });

  it("instants become ISO strings for the JSON", () => {
    const v = walkView({ ...base, requestedAt: new Date(base.requestedAt), startedAt: null, finishedAt: new Date("2026-12-03T09:16:00Z") });
    expect(v).toMatchObject({ requestedAt: base.requestedAt, finishedAt: "2026-12-03T09:16:00.000Z", startedAt: null });
  });
});
