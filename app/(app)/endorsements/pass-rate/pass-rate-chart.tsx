"use client";
import { BarController, BarElement, CategoryScale, Chart as ChartJS, LinearScale, Tooltip } from "chart.js";
import { Bar } from "react-chartjs-2";

ChartJS.register(BarController, BarElement, CategoryScale, LinearScale, Tooltip);

/** First-attempt pass rate per course as bars; the target is named in the caption (the table carries the numbers). */
export function PassRateChart({ rows, target }: { rows: { label: string; rate: number | null }[]; target: number }) {
  return (
    <figure className="card" data-testid="pass-rate-chart">
      {/* clips the canvas until chart.js has resized it to a narrower screen */}
      <div className="relative min-w-0 overflow-hidden" style={{ height: 260 }}>
        <Bar
          aria-label={`Bar chart of the first-attempt pass rate per course; target ${target} %`}
          role="img"
          data={{
            labels: rows.map((r) => r.label),
            datasets: [
              {
                label: "First-attempt pass rate (%)",
                data: rows.map((r) => r.rate ?? 0),
                backgroundColor: rows.map((r) => (r.rate !== null && r.rate >= target ? "#1f9c8c" : "#d48a16")),
              },
            ],
          }}
          options={{ maintainAspectRatio: false, scales: { y: { min: 0, max: 100, title: { display: true, text: "%" } } } }}
        />
      </div>
      <figcaption className="text-ink-soft">
        Bars at or above {target} % in teal, below it in amber; the table above has every number.
      </figcaption>
    </figure>
  );
}
