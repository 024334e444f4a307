import { addYears, retentionFor, RETENTION_RULES } from "@/lib/retention/rules";

// Retention counted from the end of training. Periods from the rules named beside each case:
// 14 CFR 141.101(d) (1 year, school training records), 14 CFR 61.189(c) (3 years, instructor
// records), EASA ORA.ATO.120 (3 years, approved training organisation).

describe("retention periods", () => {
  it("keeps school training records 1 year after training ended (14 CFR 141.101(d))", () => {
    const d = retentionFor({ endedOn: "2025-03-10", rules: ["school_records"], onHold: false, today: "2026-03-10" });
    expect(d).toEqual({ state: "kept", keepUntil: "2026-03-10", governing: ["school_records"] });
    expect(retentionFor({ endedOn: "2025-03-10", rules: ["school_records"], onHold: false, today: "2026-03-11" }).state).toBe("due");
  });

  it("keeps instructor records 3 years (14 CFR 61.189(c))", () => {
    const d = retentionFor({ endedOn: "2023-06-30", rules: ["instructor_records"], onHold: false, today: "2026-06-30" });
    expect(d).toEqual({ state: "kept", keepUntil: "2026-06-30", governing: ["instructor_records"] });
    expect(retentionFor({ endedOn: "2023-06-30", rules: ["instructor_records"], onHold: false, today: "2026-07-01" }).state).toBe("due");
  });

  it("keeps an EASA school's records 3 years (EASA ORA.ATO.120)", () => {
    const d = retentionFor({ endedOn: "2024-01-15", rules: ["easa_ato"], onHold: false, today: "2026-05-01" });
    expect(d).toEqual({ state: "kept", keepUntil: "2027-01-15", governing: ["easa_ato"] });
  });

  it("takes the longest period of the rules that apply", () => {
    // 1 year (141.101(d)) and 3 years (61.189(c)): 3 years wins
    const d = retentionFor({ endedOn: "2024-09-01", rules: ["school_records", "instructor_records"], onHold: false, today: "2025-09-02" });
    expect(d.keepUntil).toBe("2027-09-01");
    expect(d.governing).toEqual(["instructor_records"]);
    expect(d.state).toBe("kept");
    // a tie names both rules
    const tie = retentionFor({
      endedOn: "2024-09-01",
      rules: ["easa_ato", "instructor_records", "school_records"],
      onHold: false,
      today: "2030-01-01",
    });
    expect(tie).toEqual({ state: "due", keepUntil: "2027-09-01", governing: ["instructor_records", "easa_ato"] });
  });

  it("keeps a record under a legal hold however old it is, with its date still shown", () => {
    const d = retentionFor({ endedOn: "2010-02-01", rules: ["school_records"], onHold: true, today: "2026-12-02" });
    expect(d).toEqual({ state: "held", keepUntil: "2011-02-01", governing: ["school_records"] });
  });

  it("counts nothing while the student is in training", () => {
    expect(retentionFor({ endedOn: null, rules: ["school_records"], onHold: false, today: "2026-12-02" })).toEqual({
      state: "in_training",
      keepUntil: null,
      governing: [],
    });
  });

  it("reports an archived record as archived", () => {
    expect(retentionFor({ endedOn: "2020-01-01", rules: ["school_records"], onHold: false, archived: true, today: "2026-12-02" })).toEqual({
      state: "archived",
      keepUntil: "2021-01-01",
      governing: ["school_records"],
    });
  });

  it("never shortens a period: 29 February plus a year is 1 March (common practice for 'at least a year')", () => {
    expect(addYears("2024-02-29", 1)).toBe("2025-03-01");
    expect(addYears("2024-02-29", 4)).toBe("2028-02-29");
    expect(addYears("2025-12-31", 3)).toBe("2028-12-31");
  });

  it("names its sources", () => {
    expect(RETENTION_RULES.school_records).toMatchObject({ years: 1, source: "14 CFR 141.101(d)" });
    expect(RETENTION_RULES.instructor_records).toMatchObject({ years: 3, source: "14 CFR 61.189(c)" });
    expect(RETENTION_RULES.easa_ato).toMatchObject({ years: 3, source: "EASA ORA.ATO.120" });
  });
});
