import { CAUTION_TEXT } from "@/components/caution";
import type { Box } from "@/lib/curve-lab/label-placement";
import { BOARD_PALETTE, CURVE_DASH, PAPER_PALETTE, type ChartExporter } from "./curve-chart";
import { CONFIGURATION_LABELS, CURVE_KEYS, CURVE_LABELS, speedUnitLabel, type CurveKey, type DemoSpec } from "@/lib/curve-lab/demo-spec";
import { mToFt } from "@/lib/aero";
import { formatNumber } from "./format";

/**
 * The exported chart stands alone: the demo's title, the aircraft, every case with its colour,
 * the legend (case colour × curve dash), the axes and their units, and the caution line, around
 * the chart itself, at least 1600 px wide; on the board or on white paper for printing.
 */
export interface ExportMeta {
  title: string;
  aircraft: string;
  /** one line per case: its label and what sets it apart (mass, altitude, configuration) */
  cases: { label: string; detail: string }[];
  /** the drawn curves, for the legend */
  curves: { key: CurveKey; label: string }[];
  /** e.g. "Speed: EAS (= IAS = CAS here), kt · Drag: N" */
  axes: string;
  /** e.g. the axis assumption */
  note?: string;
}

export const EXPORT_WIDTH = 1800;

export interface ComposedExport {
  canvas: HTMLCanvasElement;
  /** every text drawn, in order (the tests read it; no OCR needed) */
  texts: string[];
}

/** Wraps `text` to lines no wider than `width` at the context's current font. */
function wrap(ctx: CanvasRenderingContext2D, text: string, width: number): string[] {
  const words = text.split(/\s+/);
  const lines: string[] = [];
  let line = "";
  for (const w of words) {
    const next = line ? `${line} ${w}` : w;
    if (line && ctx.measureText(next).width > width) {
      lines.push(line);
      line = w;
    } else line = next;
  }
  if (line) lines.push(line);
  return lines;
}

export function composeExport(draw: ChartExporter, meta: ExportMeta, { light }: { light: boolean }): ComposedExport {
  const pal = light ? PAPER_PALETTE : BOARD_PALETTE;
  const W = EXPORT_WIDTH;
  const M = 48;
  const body = 26;
  const chartBox: Box = { x: M, y: 0, w: W - 2 * M, h: 900 };
  const canvas = document.createElement("canvas");
  canvas.width = W;
  // measure first on a scratch context, then size the canvas and draw
  const scratch = canvas.getContext("2d");
  if (!scratch) throw new Error("no 2D canvas");
  scratch.font = `${body}px sans-serif`;
  const caution = wrap(scratch, CAUTION_TEXT, W - 2 * M);
  const note = meta.note ? wrap(scratch, meta.note, W - 2 * M) : [];
  const legendRows = Math.ceil((meta.cases.length * meta.curves.length) / 3);
  const header = M + 52 + 40 + meta.cases.length * 36 + 16;
  chartBox.y = header;
  const footer = 24 + legendRows * 36 + 12 + 36 + (note.length + caution.length) * 34 + M;
  canvas.height = header + chartBox.h + footer;

  const ctx = canvas.getContext("2d")!;
  const texts: string[] = [];
  const text = (t: string, x: number, y: number, font: string, colour: string) => {
    ctx.font = font;
    ctx.fillStyle = colour;
    ctx.fillText(t, x, y);
    texts.push(t);
  };
  ctx.fillStyle = pal.bg;
  ctx.fillRect(0, 0, canvas.width, canvas.height);
  ctx.textBaseline = "top";
  ctx.textAlign = "left";
  let y = M;
  text(meta.title, M, y, `700 44px sans-serif`, pal.chalk);
  y += 52;
  text(`Aircraft: ${meta.aircraft}`, M, y, `600 ${body + 2}px sans-serif`, pal.chalk);
  y += 40;
  meta.cases.forEach((c, i) => {
    ctx.fillStyle = pal.cases[i] ?? pal.chalk;
    ctx.beginPath();
    ctx.arc(M + 10, y + 14, 10, 0, Math.PI * 2);
    ctx.fill();
    text(`${c.label}: ${c.detail}`, M + 30, y, `${body}px sans-serif`, pal.chalk);
    y += 36;
  });

  draw(ctx, chartBox, { light, fontPx: 24, lineWidth: 3.5 });
  y = chartBox.y + chartBox.h + 24;

  // legend: case colour × curve dash, three to a row
  const colW = (W - 2 * M) / 3;
  let n = 0;
  meta.cases.forEach((c, i) =>
    meta.curves.forEach((k) => {
      const x = M + (n % 3) * colW;
      const ly = y + Math.floor(n / 3) * 36;
      ctx.save();
      ctx.strokeStyle = pal.cases[i] ?? pal.chalk;
      ctx.lineWidth = k.key === "total" ? 5 : 4;
      ctx.setLineDash(CURVE_DASH[k.key].map((v) => v * 1.4));
      ctx.beginPath();
      ctx.moveTo(x, ly + 14);
      ctx.lineTo(x + 56, ly + 14);
      ctx.stroke();
      ctx.restore();
      text(`${c.label}: ${k.label}`, x + 68, ly, `${body - 2}px sans-serif`, pal.chalk);
      n++;
    }),
  );
  y += legendRows * 36 + 12;
  text(meta.axes, M, y, `${body}px sans-serif`, pal.dim);
  y += 36;
  for (const l of note) {
    text(l, M, y, `${body - 2}px sans-serif`, pal.dim);
    y += 34;
  }
  for (const l of caution) {
    text(l, M, y, `600 ${body - 2}px sans-serif`, pal.chalk);
    y += 34;
  }
  return { canvas, texts };
}

/** Hands a canvas to the browser as a PNG download, at once (Chromium will not download a data: URL, so a Blob). */
export function downloadCanvas(canvas: HTMLCanvasElement, fileName: string): void {
  const base64 = canvas.toDataURL("image/png").split(",")[1] ?? "";
  const bytes = Uint8Array.from(atob(base64), (c) => c.charCodeAt(0));
  const a = document.createElement("a");
  a.href = URL.createObjectURL(new Blob([bytes], { type: "image/png" }));
  a.download = fileName;
  a.click();
  setTimeout(() => URL.revokeObjectURL(a.href), 1000);
}

/** The export's words for a demo as it stands (the curves the chart draws, every case). */
export function exportMetaFor(name: string, spec: DemoSpec, hidden: CurveKey[] = []): ExportMeta {
  const curves = CURVE_KEYS.filter((k) => spec.curves[k] && !hidden.includes(k)).map((key) => ({ key, label: CURVE_LABELS[key] }));
  const unit = speedUnitLabel(spec.axis.unit);
  const axes = [
    `Speed: ${spec.axis.speed === "true" ? "TAS" : "EAS (= IAS = CAS here)"}, ${unit}`,
    "Drag: N",
    ...(curves.some((c) => c.key === "power") ? ["Power required: kW"] : []),
    ...(curves.some((c) => c.key === "liftToDrag") ? ["L/D: ratio"] : []),
  ].join(" · ");
  return {
    title: name || "Demo",
    aircraft: spec.airframe.name,
    cases: spec.cases.map((c) => ({
      label: c.label,
      detail: [
        `${formatNumber(c.massKg)} kg`,
        `${formatNumber(mToFt(c.altitudeM))} ft`,
        `ISA ${c.isaDeviationK >= 0 ? "+" : "−"}${formatNumber(Math.abs(c.isaDeviationK))} K`,
        CONFIGURATION_LABELS[c.configuration].toLowerCase(),
      ].join(", "),
    })),
    curves,
    axes,
  };
}
