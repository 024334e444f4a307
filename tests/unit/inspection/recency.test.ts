import { recencyDue, isCurrentOn } from "@/lib/inspection/recency";

// Recency in the instructor files: calendar months after the recency activity, as the signer's
// standing counts it (db/access/records/signer-standing.ts). The clamp to the month's last day is
// date-fns addMonths (common practice for calendar-month periods).

describe("an instructor's recency", () => {
  it("runs for whole calendar months after the activity, clamped to the end of a shorter month", () => {
    expect(recencyDue("2026-01-01", 24)).toBe("2028-01-01");
    expect(recencyDue("2026-01-31", 1)).toBe("2026-02-28");
    expect(recencyDue("2027-12-15", 3)).toBe("2028-03-15");
  });

  it("is current before its last day and lapsed from it", () => {
    expect(isCurrentOn("2027-12-31", "2028-01-01")).toBe(true);
    expect(isCurrentOn("2028-01-01", "2028-01-01")).toBe(false);
  });
});
