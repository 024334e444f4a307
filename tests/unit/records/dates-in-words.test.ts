import { watchNotes, type SignOffFacts } from "@/lib/records/watch-notes";
import { stageCheckStatement } from "@/lib/records/statements";
import { endorsementStatement } from "@/lib/endorsements/rules";

// People read these sentences (the Sign-off register's watch notes, the statements signers certify):
// dates come in the one date style of lib/time.ts ("Thu 3 Dec 2026"), never as yyyy-MM-dd.
const ISO = /\d{4}-\d{2}-\d{2}/;

const signOff = (over: Partial<SignOffFacts>): SignOffFacts => ({
  id: "s1",
  student_id: "st1",
  student_name: "Ada Quill",
  item_id: "i1",
  item_code: "AER-03",
  course_id: "c1",
  signer_id: "p1",
  signer_name: "Rufus Penhallow",
  signed_on: "2026-12-01",
  signed_at: new Date("2026-12-01T15:00:00Z"),
  check_at: new Date("2026-12-03T10:00:00Z"),
  amends_id: null,
  amend_reason: null,
  withdraw_reason: null,
  ...over,
});

describe("dates people read are words", () => {
  it("a sign-off dated before its check and a signer not current name both days in words", () => {
    const notes = watchNotes({
      timeZone: "Europe/London",
      lateEntryDays: 7,
      signOffs: [signOff({})],
      stageChecks: [],
      oralChecks: [],
      missedSessions: new Set(),
      standingOf: () => ({ qualified: true, current: false }),
    });
    const before = notes.find((n) => n.kind === "signed_before_check");
    expect(before?.detail).toBe("signed for Tue 1 Dec 2026, its check is of Thu 3 Dec 2026");
    const notCurrent = notes.find((n) => n.kind === "signer_not_current");
    expect(notCurrent?.detail).toBe("Rufus Penhallow was not current on Tue 1 Dec 2026");
    for (const n of notes) expect(n.detail).not.toMatch(ISO);
  });

  it("the stage-check statement names the day of the check in words", () => {
    const text = stageCheckStatement({
      examinerName: "Imogen Farrant",
      studentName: "Ada Quill",
      stageCode: "S1",
      stageTitle: "Aerodynamics",
      occurredOn: "2026-12-03",
    });
    expect(text).toContain("on Thu 3 Dec 2026,");
    expect(text).not.toMatch(ISO);
  });

  it("the endorsement statement names the day in words", () => {
    const text = endorsementStatement({ instructorName: "R P", wording: "Ready.", endorsedOn: "2026-12-03", authorityName: "Authority" });
    expect(text).toContain("current on Thu 3 Dec 2026.");
    expect(text).not.toMatch(ISO);
  });
});
