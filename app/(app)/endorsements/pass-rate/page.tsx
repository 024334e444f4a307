import type { Metadata } from "next";
import { requirePagePermission } from "@/lib/auth/guard";
import { passRateReport } from "@/db/access/endorsements/pass-rate";
import { PASS_RATE_TARGET_PERCENT } from "@/lib/endorsements/rules";
import { formatDay } from "@/lib/time";
import { ScrollArea } from "@/components/ui/scroll-area";
import { Caution } from "@/components/caution";
import { PassRateChart } from "./pass-rate-chart";

export const metadata: Metadata = { title: "First-attempt pass rate" };
export const dynamic = "force-dynamic";

export default async function PassRatePage() {
  const user = await requirePagePermission("reports.view", "/endorsements/pass-rate");
  const { window, rows } = await passRateReport(user);
  return (
    <div className="max-w-4xl space-y-6">
      <div>
        <h1 className="text-display">First-attempt pass rate</h1>
        <p className="text-ink-soft">
          Knowledge tests per course, each student&apos;s first result only, taken from {formatDay(window.from)} to {formatDay(window.to)}{" "}
          (the last 24 calendar months). A school keeps {PASS_RATE_TARGET_PERCENT} % or better (14 CFR 141.5(d)).
        </p>
      </div>
      <Caution />
      <ScrollArea label="Pass rate per course">
        <table className="data-table" data-testid="pass-rate-table">
          <thead>
            <tr>
              <th scope="col">Course</th>
              <th scope="col">First attempts</th>
              <th scope="col">Passed</th>
              <th scope="col">Rate</th>
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr key={r.courseId}>
                <td>
                  {r.courseCode} {r.courseTitle}
                </td>
                <td className="num">{r.firstAttempts}</td>
                <td className="num">{r.passed}</td>
                <td className="num">
                  {r.ratePercent === null
                    ? "No tests"
                    : `${r.ratePercent} %${r.ratePercent < PASS_RATE_TARGET_PERCENT ? ` (below ${PASS_RATE_TARGET_PERCENT} %)` : ""}`}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </ScrollArea>
      <PassRateChart rows={rows.map((r) => ({ label: r.courseCode, rate: r.ratePercent }))} target={PASS_RATE_TARGET_PERCENT} />
    </div>
  );
}
