import { ktToMs } from "@/lib/aero";
import { callGap, callGapSentence } from "@/lib/curve-lab/call-gap";

describe("Call it first: the gap shown is the difference of the numbers shown", () => {
  it("62 kt against 70 kt reads 8 kt slow, even when the unrounded gap is 8.1 kt", () => {
    // the unrounded speeds: 62.4 kt and 70.49 kt, 8.09 kt apart
    const g = callGap(ktToMs(62.4), ktToMs(70.49), "kt");
    expect(g).toEqual({ call: "62 kt", answer: "70 kt", gap: "8 kt", direction: "slow" });
    expect(callGapSentence(g)).toBe("Your call 62 kt · answer 70 kt · 8 kt slow");
  });

  it("rounds both numbers before subtracting: 70.6 kt against 69.4 kt is 71 − 69 = 2 kt fast, not 1.2", () => {
    expect(callGap(ktToMs(70.6), ktToMs(69.4), "kt")).toMatchObject({ call: "71 kt", answer: "69 kt", gap: "2 kt", direction: "fast" });
  });

  it("m/s are shown to one decimal and the gap with the same precision", () => {
    expect(callGap(31.26, 35.04, "ms")).toEqual({ call: "31.3 m/s", answer: "35.0 m/s", gap: "3.7 m/s", direction: "slow" });
  });

  it("a call that rounds to the answer is on the answer, not '0 kt fast'", () => {
    const g = callGap(ktToMs(70.2), ktToMs(69.8), "kt");
    expect(g.direction).toBe("on the answer");
    expect(callGapSentence(g)).toBe("Your call 70 kt · answer 70 kt · right on the answer");
  });

  it("for any two speeds, call − answer as printed equals the printed gap with its sign", () => {
    for (let i = 0; i < 500; i++) {
      const p = 15 + ((i * 7919) % 6000) / 100;
      const a = 15 + ((i * 104729) % 6000) / 100;
      for (const unit of ["kt", "ms"] as const) {
        const g = callGap(p, a, unit);
        const num = (s: string) => Number(s.split(" ")[0]);
        const signed = g.direction === "slow" ? -num(g.gap) : num(g.gap);
        expect(Math.abs(num(g.call) - num(g.answer) - signed)).toBeLessThan(1e-9);
      }
    }
  });
});
