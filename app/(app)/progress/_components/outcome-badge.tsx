import { OUTCOME_LABEL, type QuestionOutcome } from "@/lib/records/outcome";

const STYLE: Record<QuestionOutcome, string> = {
  solid: "bg-solid-100 text-solid-800 border-solid-600",
  shaky: "bg-shaky-100 text-shaky-800 border-shaky-600",
  not_yet: "bg-notyet-100 text-notyet-800 border-notyet-600",
};
const MARK: Record<QuestionOutcome, string> = { solid: "●", shaky: "◐", not_yet: "○" };

/** An outcome with its word always beside the colour (never colour alone). */
export function OutcomeBadge({ outcome, prefix }: { outcome: QuestionOutcome; prefix?: string }) {
  return (
    <span className={`inline-flex items-center gap-1 rounded border px-1.5 text-caption font-semibold ${STYLE[outcome]}`}>
      <span aria-hidden="true">{MARK[outcome]}</span>
      {prefix && <span className="num">{prefix}</span>}
      {OUTCOME_LABEL[outcome]}
    </span>
  );
}
