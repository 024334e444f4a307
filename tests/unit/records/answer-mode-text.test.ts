import { REFERENCE_AIRCRAFT, answerModeText, generateQuestion, type GeneratedQuestion } from "@/lib/records/questions";

// Issue 12 leftover: a stored question says which answer the instructor accepted, with its tolerance,
// wherever the record shows it (record page, Progress map, printed record).

const LT2 = REFERENCE_AIRCRAFT.find((a) => a.source.id === "lt-2")!;

describe("answerModeText", () => {
  it("says the rule of thumb was accepted, names the rule and gives the accepted range", () => {
    const q = generateQuestion("vmd", LT2, { massKg: 1000, altitudeFt: 6000 }, { answerMode: "rule_of_thumb" });
    // TAS from IAS at 2 % per 1,000 ft: common practice (RULE_OF_THUMB in lib/records/questions.ts)
    expect(answerModeText(q)).toMatch(
      /^Rule of thumb accepted \(TAS = IAS \+ 2 % per 1,000 ft: \d+\.\d kt\): accepted \d+\.\d to \d+\.\d kt, the rule's answer to the exact one with 3 % either side$/,
    );
    const rule = q.ruleOfThumb!.value;
    expect(answerModeText(q)).toContain(`${rule.toFixed(1)} kt`);
  });

  it("says the exact answer was asked, with the 3 % band", () => {
    const q = generateQuestion("vmd", LT2, { massKg: 1000, altitudeFt: 6000 }, { answerMode: "exact" });
    const v = q.answer.value as number;
    expect(answerModeText(q)).toBe(`Exact answer asked: accepted within 3 %, ${(v * 0.97).toFixed(1)} to ${(v * 1.03).toFixed(1)} kt`);
  });

  it("a question stored before the choice existed reads as asked exactly; a choice has no tolerance", () => {
    const q = generateQuestion("vmd", LT2, { massKg: 1000, altitudeFt: 0 });
    const old: GeneratedQuestion = { ...q };
    delete old.answerMode;
    delete old.accepted;
    expect(answerModeText(old)).toMatch(/^Exact answer asked: accepted within 3 %/);
    const choice = generateQuestion("stability_side", LT2, { massKg: 1000, altitudeFt: 0, speedKt: 100 });
    expect(choice.answer.type).toBe("choice");
    expect(answerModeText(choice)).toBe("Exact answer asked (a choice, no tolerance)");
  });
});
