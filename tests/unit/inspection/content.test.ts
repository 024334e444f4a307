import { createHash } from "node:crypto";
import { packDocument, recordHash, passRateWords, type PackInput } from "@/lib/inspection/content";

// The inspection pack's content (pure): what each section says, the record hash's basis, and a
// section another area adds. The PDF's extracted text is checked in tests/integration/inspection.

const HEAD = "cd".repeat(32);

function input(over: Partial<PackInput> = {}): PackInput {
  return {
    school: { name: "Larkhollow Flying School", timeZone: "Europe/London", certificateNumber: null },
    student: {
      name: "Zofia Wróbel",
      email: "zofia.wrobel@chalkwing.test",
      courseCode: "PPL-GS",
      courseTitle: "Private pilot ground school",
      minGroundMinutes: 35 * 60,
      enrolledOn: "2026-08-30",
      cohortName: "Kestrel",
      leadInstructorName: "Tomasz Varga",
      ended: null,
    },
    syllabus: { number: 3, approvedOn: "2026-06-01", effectiveFrom: "2026-07-01", changeNote: "Stage AER split in two" },
    groundMinutes: 90,
    groundLog: [{ date: "2026-11-20", title: "Drag and Vmd", status: "late", minutes: 75, instructorName: "Tomasz Varga" }],
    checks: [],
    signOffs: [],
    stageChecks: [],
    endorsements: [],
    certification: null,
    chain: { ok: true, checked: 12, headHash: HEAD, headPosition: 12, lastGoodHash: HEAD, broken: null, basis: null },
    instructors: [],
    passRate: {
      window: { from: "2024-12-01", to: "2026-11-30" },
      rows: [{ courseCode: "PPL-GS", courseTitle: "Private pilot ground school", firstAttempts: 5, passed: 3, ratePercent: 60 }],
    },
    transferCredits: [],
    retention: { endedOn: null, keepUntil: null, governing: [], state: "in_training", hold: null, archived: null },
    ...over,
  };
}

const allText = (p: PackInput) =>
  packDocument(p)
    .sections.flatMap((s) => [s.heading, ...s.blocks.flatMap((b) => (b.kind === "text" ? [b.text] : [b.header, ...b.rows].flat()))])
    .join("\n");

describe("the inspection pack's content", () => {
  it("words the enrolment, the syllabus revision, the ground log and an active enrolment", () => {
    const text = allText(input());
    expect(text).toContain("Enrolled on Sun 30 Aug 2026; cohort Kestrel; lead instructor Tomasz Varga");
    expect(text).toContain("Training in progress (enrolment active)");
    expect(text).toContain("Revision 3 of PPL-GS: approved Mon 1 Jun 2026, effective from Wed 1 Jul 2026");
    expect(text).toContain("Change note: Stage AER split in two");
    // 90 min = 1.5 h of the 35 h minimum; the late entry credits 75 min = 1.3 h (one decimal)
    expect(text).toContain("Credited ground time: 1.5 of 35 h");
    expect(text).toContain("1.3 h");
    expect(text).toContain("Late");
    expect(text).toContain("Not certified");
  });

  it("says plainly when the audit chain does not verify, with the newest row and the last good link", () => {
    const text = allText(
      input({
        chain: {
          ok: false,
          checked: 7,
          headHash: HEAD,
          headPosition: 12,
          lastGoodHash: "ef".repeat(32),
          broken: { position: 8, problem: "hash mismatch" },
          basis: null,
        },
      }),
    );
    expect(text).toContain("NOT VERIFIED: the chain breaks at position 8 (hash mismatch); 7 events before it link up.");
    expect(text).toContain(`Head hash ${HEAD}`);
    expect(text).toContain(`Last link that verifies ${"ef".repeat(32)}`);
  });

  it("marks a pass rate below 80 % (14 CFR 141.5(d)) and a course without tests", () => {
    expect(passRateWords(60)).toBe("60 % (below 80 %)");
    expect(passRateWords(80)).toBe("80 %");
    expect(passRateWords(null)).toBe("No tests");
    expect(allText(input())).toContain("60 % (below 80 %)");
  });

  it("prints transfer-in credit with its cap, items, test, evidence hash and audit event, before the ground log", () => {
    const withCredit = input({
      transferCredits: [
        {
          sourceSchool: "Eastmere Aero Club (fictional)",
          sourceApproved: false,
          creditedMinutes: 300,
          capMinutes: 525,
          testKind: "knowledge",
          testTakenOn: "2026-09-02",
          testResult: "84 %",
          itemCodes: ["AER-01", "AER-02"],
          evidenceFileName: "eastmere-record.pdf",
          evidenceSha256: "ab".repeat(32),
          recordedByName: "Mira Okonjo",
          recordedOn: "2026-09-03",
          auditHash: HEAD,
        },
      ],
    });
    const doc = packDocument(withCredit);
    const headings = doc.sections.map((s) => s.heading);
    expect(headings.indexOf("Transfer-in credit")).toBe(headings.indexOf("Ground log") - 1);
    expect(allText(input())).toContain("None: no credit from an earlier school.");
    const credit = doc.sections
      .find((s) => s.heading === "Transfer-in credit")!
      .blocks.map((b) => (b.kind === "text" ? b.text : ""))
      .join("\n");
    // 525 min = 25 % of the 35 h course (14 CFR 141.77(c), course not approved)
    expect(credit).toContain("Eastmere Aero Club (fictional) (course not approved): 5 h credited of a cap of 8.8 h (14 CFR 141.77(c))");
    expect(credit).toContain("Items credited: AER-01, AER-02");
    expect(credit).toContain("Test given by this school: Knowledge, taken on Wed 2 Sep 2026: 84 %");
    expect(credit).toContain(`Evidence SHA-256 ${"ab".repeat(32)}`);
    expect(allText(withCredit)).toContain("Credited ground time: 1.5 of 35 h (including transfer-in credit)");
  });

  it("gives the retention date with the rules that set it, a legal hold, and an unended training", () => {
    expect(allText(input())).toContain("Training has not ended: the retention date is counted from the end of training.");
    const text = allText(
      input({
        retention: {
          endedOn: "2026-12-01",
          keepUntil: "2029-12-01",
          governing: ["instructor_records", "easa_ato"],
          state: "held",
          hold: { reason: "Inspection by the authority", setOn: "2026-12-02", setByName: "Mira Okonjo" },
          archived: null,
        },
      }),
    );
    // 3 years after the end of training (14 CFR 61.189(c); EASA ORA.ATO.120), the longest rule
    expect(text).toContain(
      "Kept until Sat 1 Dec 2029: Tue 1 Dec 2026, the end of training, plus the longest rule that applies (14 CFR 61.189(c), 3 years; EASA ORA.ATO.120, 3 years)",
    );
    expect(text).toContain("Legal hold since Wed 2 Dec 2026 (Mira Okonjo): Inspection by the authority");
    const due = allText(
      input({
        retention: {
          endedOn: "2024-01-10",
          keepUntil: "2025-01-10",
          governing: ["school_records"],
          state: "due",
          hold: null,
          archived: null,
        },
      }),
    );
    expect(due).toContain("(14 CFR 141.101(d), 1 year)");
    expect(due).toContain("Past its retention date: listed for the chief instructor to archive; nothing is deleted.");
  });

  it("gives each instructor file with what they did, every qualification version, recency and briefings taught", () => {
    const version = {
      certificateKind: "Ground instructor",
      certificateNumber: "LHV-GI-0142",
      ratings: [],
      checkInstructor: false,
      issuedOn: "2020-01-01",
      recencyMonths: 24,
      recordedByName: "Mira Okonjo",
    };
    const text = allText(
      input({
        instructors: [
          {
            name: "Tomasz Varga",
            parts: ["checked", "signed", "taught"],
            versions: [
              { ...version, version: 2, recencyOn: "2026-10-01", validFrom: "2026-10-01", validTo: null, changeNote: "Recency renewed" },
              { ...version, version: 1, recencyOn: "2024-09-01", validFrom: "2020-01-01", validTo: "2026-10-01", changeNote: "" },
            ],
            courses: [{ code: "PPL-GS", validFrom: null, validTo: null }],
            recency: [{ certificateNumber: "LHV-GI-0142", dueOn: "2028-10-01", current: true }],
            briefingsTaught: [{ title: "Drag curves", sessions: 4, firstOn: "2026-09-10", lastOn: "2026-11-20" }],
          },
          {
            name: "Ada Quill",
            parts: ["examined"],
            versions: [],
            courses: [],
            recency: [{ certificateNumber: "LHV-GI-0007", dueOn: "2026-11-01", current: false }],
            briefingsTaught: [],
          },
        ],
      }),
    );
    expect(text).toContain("Tomasz Varga (checked, signed, taught)");
    expect(text).toContain("Recency: LHV-GI-0142 current, recency runs out on Sun 1 Oct 2028");
    expect(text).toContain("Thu 1 Oct 2026 to today");
    expect(text).toContain("Wed 1 Jan 2020 to Thu 1 Oct 2026");
    expect(text).toContain("Recency renewed (Mira Okonjo)");
    expect(text).toContain("Courses: PPL-GS from the start");
    expect(text).toContain("Briefings taught: Drag curves (4 sessions, Thu 10 Sep 2026 to Fri 20 Nov 2026)");
    expect(text).toContain("Recency: LHV-GI-0007 not current, recency ran out on Sun 1 Nov 2026");
    expect(text).toContain("Briefings taught: none");
  });

  it("hashes the content as printed with SHA-256: same content, same hash; any changed line, another hash", () => {
    const doc = packDocument(input());
    const printed = { ...doc, sections: doc.sections.filter((x) => x.heading !== "Audit chain verification") };
    expect(printed.sections.length).toBe(doc.sections.length - 1);
    expect(recordHash(doc)).toBe(createHash("sha256").update(JSON.stringify(printed)).digest("hex"));
    expect(recordHash(packDocument(input()))).toBe(recordHash(doc));
    expect(recordHash(packDocument(input({ groundMinutes: 120 })))).not.toBe(recordHash(doc));
    // the hash covers what is printed: 91 minutes print as 1.5 h, like 90
    expect(recordHash(packDocument(input({ groundMinutes: 91 })))).toBe(recordHash(doc));
  });

  it("leaves the audit chain's verification out of the record hash: the chain moves with every event of the school", () => {
    const doc = packDocument(input());
    const moved = packDocument(
      input({
        chain: {
          ok: true,
          checked: 40,
          headHash: "b".repeat(64),
          headPosition: 40,
          lastGoodHash: "b".repeat(64),
          broken: null,
          basis: null,
        },
      }),
    );
    expect(JSON.stringify(moved)).not.toBe(JSON.stringify(doc));
    expect(recordHash(moved)).toBe(recordHash(doc));
  });

  it("says on what the chain's verification rests: a full walk and the events after it, or a walk made for the pack", () => {
    const text = (c: Partial<PackInput["chain"]>) =>
      JSON.stringify(
        packDocument(input({ chain: { ...input().chain, ...c } })).sections.find((x) => x.heading === "Audit chain verification"),
      );
    expect(text({ basis: null })).toContain("The whole chain was walked from its first event as this pack was made.");
    const basis = { through: 9, finishedAt: new Date("2026-11-30T17:05:00Z"), requestedBy: "Mira Okonjo" };
    expect(text({ basis })).toContain(
      "Positions 1 to 9 were verified by the full walk of the chain that ended Mon 30 Nov 2026, 17:05 (asked for by Mira Okonjo); the events after it were checked from that walk's last hash as this pack was made.",
    );
    expect(text({ basis: { ...basis, through: 12 } })).toContain(
      "its last hash was found again at position 12 as this pack was made, and no event has been written since",
    );
  });
});
