"use client";
import { Chart as ChartJS, BarElement, CategoryScale, LinearScale, Legend, Tooltip } from "chart.js";
import { Bar } from "react-chartjs-2";
import { ScrollArea } from "@/components/ui/scroll-area";
import { formatDay } from "@/lib/time";

ChartJS.register(BarElement, CategoryScale, LinearScale, Legend, Tooltip);

/** Question outcomes per check date, stacked: Solid, Shaky, Not yet (the table below carries the same numbers). */
export function OutcomeChart({ data }: { data: { date: string; solid: number; shaky: number; notYet: number }[] }) {
  return (
    <figure>
      {/* chart.js sizes the canvas to this box after a resize; until it does, the box clips the
          canvas so a turn from a wide to a narrow screen never makes the page scroll sideways */}
      <div className="relative h-56 min-w-0 overflow-hidden">
        <Bar
          aria-label="Question outcomes per check date"
          role="img"
          data={{
            labels: data.map((d) => d.date),
            datasets: [
              { label: "Solid", data: data.map((d) => d.solid), backgroundColor: "#2e7d3a" },
              { label: "Shaky", data: data.map((d) => d.shaky), backgroundColor: "#a86a05" },
              { label: "Not yet", data: data.map((d) => d.notYet), backgroundColor: "#b8324f" },
            ],
          }}
          options={{
            maintainAspectRatio: false,
            responsive: true,
            scales: { x: { stacked: true }, y: { stacked: true, ticks: { precision: 0 }, title: { display: true, text: "questions" } } },
          }}
        />
      </div>
      <figcaption className="mt-2">
        <ScrollArea label="Outcomes per date">
          <table className="data-table text-caption">
            <thead>
              <tr>
                <th scope="col">Date</th>
                <th scope="col">Solid</th>
                <th scope="col">Shaky</th>
                <th scope="col">Not yet</th>
              </tr>
            </thead>
            <tbody>
              {data.map((d) => (
                <tr key={d.date}>
                  <td className="num">{formatDay(d.date)}</td>
                  <td className="num">{d.solid}</td>
                  <td className="num">{d.shaky}</td>
                  <td className="num">{d.notYet}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </ScrollArea>
      </figcaption>
    </figure>
  );
}
