import { speedInUnit, speedUnitLabel } from "./demo-spec";

/**
 * Call it first: the student's call, the answer and the gap between them, as shown. The gap is the
 * difference of the two displayed (rounded) numbers, so "your call 62 kt, answer 70 kt" always reads
 * "8 kt slow", never "8.1 kt slow". Knots are shown whole, m/s to one decimal.
 */
export interface CallGap {
  call: string;
  answer: string;
  /** the gap in the shown unit and precision, without sign */
  gap: string;
  direction: "fast" | "slow" | "on the answer";
}

export function callGap(predictedMs: number, actualMs: number, unit: "kt" | "ms"): CallGap {
  const digits = unit === "kt" ? 0 : 1;
  const scale = 10 ** digits;
  const shown = (ms: number) => Math.round(speedInUnit(ms, unit) * scale);
  const p = shown(predictedMs);
  const a = shown(actualMs);
  const u = speedUnitLabel(unit);
  const text = (n: number) => `${(n / scale).toFixed(digits)} ${u}`;
  const diff = p - a;
  return {
    call: text(p),
    answer: text(a),
    gap: text(Math.abs(diff)),
    direction: diff > 0 ? "fast" : diff < 0 ? "slow" : "on the answer",
  };
}

/** One line: "Your call 62 kt · answer 70 kt · 8 kt slow". */
export function callGapSentence(g: CallGap): string {
  const tail = g.direction === "on the answer" ? "right on the answer" : `${g.gap} ${g.direction}`;
  return `Your call ${g.call} · answer ${g.answer} · ${tail}`;
}
