"use client";
import { memo, useCallback, useEffect, useLayoutEffect, useRef, useState, type MutableRefObject } from "react";
import {
  Chart as ChartJS,
  LineController,
  LineElement,
  PointElement,
  LinearScale,
  type Chart,
  type ChartDataset,
  type ChartOptions,
  type Plugin,
} from "chart.js";
import { Chart as ReactChart } from "react-chartjs-2";
import {
  CURVE_KEYS,
  CURVE_LABELS,
  speedFromUnit,
  speedInUnit,
  speedUnitLabel,
  type CurveKey,
  type DemoSpec,
  type MarkerKey,
} from "@/lib/curve-lab/demo-spec";
import { formatNumber } from "./format";
import { MAX_CASES, datasetIndex, fillFrame, newFrame, type Frame } from "@/lib/curve-lab/chart-frame";
import { besideRule, nearCurve, placeLabels, withinRegion, type Box, type LabelRequest, type Pt } from "@/lib/curve-lab/label-placement";
import type { CurveSet } from "@/lib/aero";

ChartJS.register(LineController, LineElement, PointElement, LinearScale);

/** Chart colours on the slate board (our own palette; see tailwind.config.ts). */
export const BOARD = {
  bg: "#152033",
  grid: "rgba(244,241,232,0.14)",
  chalk: "#f4f1e8",
  dim: "#c9cdd6",
  stable: "#1f9c8c",
  unstable: "#d48a16",
};
/** One colour per case, and a dash pattern per curve, so neither colour nor dash alone carries the meaning (the legend names both). */
export const CASE_COLOURS = ["#f4f1e8", "#7fd1ff", "#ffb3c7", "#c8f07a"] as const;
export const CURVE_DASH: Record<CurveKey, number[]> = {
  total: [],
  zeroLift: [10, 6],
  liftDependent: [3, 5],
  idealInduced: [14, 4, 3, 4],
  increment: [2, 3],
  power: [18, 6],
  liftToDrag: [6, 3, 6, 9],
};

export type ChartVariant = "desk" | "projector";

export interface Concealment {
  regions: boolean;
  markers: MarkerKey[];
  curves: CurveKey[];
}

interface Overlay {
  spec: DemoSpec;
  frame: Frame;
  focus: number;
  conceal: Concealment | null;
  guessMs: number | null;
  answerMs: number | null;
  fontPx: number;
  lineWidth: number;
  /** per case (as in spec.cases): draw the thrust line at the chosen speed */
  thrust: boolean[];
  palette: Palette;
}

export interface CurveChartProps {
  spec: DemoSpec;
  /** the case whose Vmd splits the chart into speed-unstable and speed-stable */
  focus: number;
  variant: ChartVariant;
  /** hidden until the Call it first reveal */
  conceal?: Concealment | null;
  /** the student's call and the answer, on the axis, m/s */
  guessMs?: number | null;
  answerMs?: number | null;
  /** a click on the chart picks a speed (m/s on the axis) */
  onPickSpeed?: (ms: number) => void;
  /** receives the one chart instance (for the bench and the tests) */
  chartRef?: MutableRefObject<Chart | null>;
  /** receives the PNG export's drawing function */
  exportRef?: MutableRefObject<ChartExporter | null>;
  /** per case (as in spec.cases): draw the thrust line, thrust held at the chosen speed */
  thrust?: boolean[];
  label: string;
  className?: string;
}

/** The chart's colours: the slate board on screen, or paper for a printed export. */
export interface Palette {
  bg: string;
  grid: string;
  chalk: string;
  dim: string;
  unstableFill: string;
  stableFill: string;
  unstableText: string;
  stableText: string;
  hatch: string;
  cases: readonly string[];
  chosen: string;
  call: string;
  answer: string;
}
export const BOARD_PALETTE: Palette = {
  bg: BOARD.bg,
  grid: BOARD.grid,
  chalk: BOARD.chalk,
  dim: BOARD.dim,
  unstableFill: "rgba(212,138,22,0.20)",
  stableFill: "rgba(31,156,140,0.20)",
  unstableText: "#f2c27a",
  stableText: "#8fe0d4",
  hatch: "rgba(244,241,232,0.45)",
  cases: CASE_COLOURS,
  chosen: "#c8f07a",
  call: "#ffb3c7",
  answer: "#7fd1ff",
};
/** Dark ink on white, for printing (each case colour keeps at least 4.5:1 against white). */
export const PAPER_PALETTE: Palette = {
  bg: "#ffffff",
  grid: "rgba(20,28,44,0.16)",
  chalk: "#141c2c",
  dim: "#3d4658",
  unstableFill: "rgba(212,138,22,0.16)",
  stableFill: "rgba(31,156,140,0.14)",
  unstableText: "#8a5200",
  stableText: "#0d6157",
  hatch: "rgba(20,28,44,0.35)",
  cases: ["#141c2c", "#0b5f94", "#a3245a", "#3f6b08"],
  chosen: "#3f6b08",
  call: "#a3245a",
  answer: "#0b5f94",
};

const hatches = new Map<string, CanvasPattern | null>();
function hatchPattern(ctx: CanvasRenderingContext2D, colour: string): CanvasPattern | null {
  if (hatches.has(colour) || typeof document === "undefined") return hatches.get(colour) ?? null;
  const c = document.createElement("canvas");
  c.width = 12;
  c.height = 12;
  const g = c.getContext("2d");
  if (!g) return null;
  g.strokeStyle = colour;
  g.lineWidth = 2;
  g.beginPath();
  g.moveTo(0, 12);
  g.lineTo(12, 0);
  g.moveTo(-3, 3);
  g.lineTo(3, -3);
  g.moveTo(9, 15);
  g.lineTo(15, 9);
  g.stroke();
  const p = ctx.createPattern(c, "repeat");
  hatches.set(colour, p);
  return p;
}

function fmt(n: number, digits = 0): string {
  return formatNumber(n, digits);
}

interface TextLabel {
  id: string;
  lines: string[];
  colour: string;
  weight: 400 | 600;
  /** candidate boxes, best first (built once the text is measured) */
  place: (w: number, h: number) => Box[];
  /** last resort: candidates for the text turned to read upwards (w = its line height, h = its length) */
  upright?: (w: number, h: number) => Box[];
}

/**
 * The board plugin: background, speed-stability regions either side of the focused case's Vmd
 * (amber "speed-unstable" below, teal "speed-stable" above), stall hatched, Vmd as a solid rule
 * with a diamond at minimum drag, Vmp dashed, best glide, the chosen speed, the thrust line, the
 * student's call, and a label on every case. Every text is placed by placeLabels, so no label sits
 * on a curve, a rule or another label.
 */
function boardPlugin(overlay: { current: Overlay }): Plugin<"line"> {
  return {
    id: "curveLabBoard",
    beforeDraw(chart) {
      const { ctx, width, height } = chart;
      ctx.save();
      ctx.fillStyle = overlay.current.palette.bg;
      ctx.fillRect(0, 0, width, height);
      ctx.restore();
    },
    beforeDatasetsDraw(chart) {
      const o = overlay.current;
      const pal = o.palette;
      const c = o.frame.cases[o.focus] ?? o.frame.cases[0];
      if (!c) return;
      const { ctx, chartArea: a } = chart;
      const x = chart.scales.x!;
      const unit = o.spec.axis.unit;
      const px = (ms: number) => Math.min(a.right, Math.max(a.left, x.getPixelForValue(speedInUnit(ms, unit))));
      ctx.save();
      if (!o.conceal?.regions) {
        const xv = px(c.vmdMs);
        ctx.fillStyle = pal.unstableFill;
        ctx.fillRect(a.left, a.top, xv - a.left, a.bottom - a.top);
        ctx.fillStyle = pal.stableFill;
        ctx.fillRect(xv, a.top, a.right - xv, a.bottom - a.top);
      }
      if (o.spec.markers.stall && !o.conceal?.markers.includes("stall")) {
        const xs = px(c.stallMs);
        const pattern = hatchPattern(ctx, pal.hatch);
        if (pattern && xs > a.left) {
          ctx.fillStyle = pattern;
          ctx.fillRect(a.left, a.top, xs - a.left, a.bottom - a.top);
        }
      }
      ctx.restore();
    },
    afterDatasetsDraw(chart) {
      const o = overlay.current;
      const pal = o.palette;
      const c = o.frame.cases[o.focus] ?? o.frame.cases[0];
      if (!c) return;
      const { ctx, chartArea: a } = chart;
      const x = chart.scales.x!;
      const y = chart.scales.y!;
      const unit = o.spec.axis.unit;
      const u = speedUnitLabel(unit);
      const inside = (ms: number) => {
        const v = speedInUnit(ms, unit);
        return v >= x.min && v <= x.max;
      };
      const px = (ms: number) => x.getPixelForValue(speedInUnit(ms, unit));
      const hidden = (m: MarkerKey) => !o.spec.markers[m] || (o.conceal?.markers.includes(m) ?? false);
      const lw = o.lineWidth;
      const bounds: Box = { x: a.left, y: a.top, w: a.right - a.left, h: a.bottom - a.top };

      // every drawn line, in pixels: the labels keep clear of them
      const lines: Pt[][] = [];
      const caseLines: Pt[][] = [];
      for (let d = 0; d < o.frame.visible.length; d++) {
        if (!o.frame.visible[d]) continue;
        const k = CURVE_KEYS[d % CURVE_KEYS.length]!;
        const scale = chart.scales[k === "power" ? "power" : k === "liftToDrag" ? "ld" : "y"];
        if (!scale) continue;
        const pts = o.frame.points[d]!;
        const line: Pt[] = new Array<Pt>(pts.length);
        for (let i = 0; i < pts.length; i++) line[i] = { x: x.getPixelForValue(pts[i]!.x), y: scale.getPixelForValue(pts[i]!.y) };
        lines.push(line);
        const ci = Math.floor(d / CURVE_KEYS.length);
        if (k === "total" || !caseLines[ci]) caseLines[ci] = line;
      }
      const vertical = (ms: number) => {
        const xp = px(ms);
        lines.push([
          { x: xp, y: a.top },
          { x: xp, y: a.bottom },
        ]);
      };

      const rule = (ms: number, dash: number[], colour: string) => {
        const xp = px(ms);
        ctx.save();
        ctx.strokeStyle = colour;
        ctx.lineWidth = lw;
        ctx.setLineDash(dash);
        ctx.beginPath();
        ctx.moveTo(xp, a.top);
        ctx.lineTo(xp, a.bottom);
        ctx.stroke();
        ctx.restore();
        vertical(ms);
      };

      const labels: TextLabel[] = [];
      const step = o.fontPx * 0.6;
      const topDown = (xp: number, side: "both" | "left" | "right") => (w: number, h: number) =>
        besideRule(xp, w, h, bounds, 6, step).filter((_, i) => side === "both" || (side === "right") === (i % 2 === 0));
      const bottomUp = (xp: number, side: "both" | "left" | "right") => (w: number, h: number) => topDown(xp, side)(w, h).reverse();

      if (!o.conceal?.regions) {
        const xv = Math.min(a.right, Math.max(a.left, px(c.vmdMs)));
        // anywhere on its own side of Vmd, nearest the rule first: on a narrow phone chart the label still finds a gap
        const within = (side: "left" | "right") => (w: number, h: number) => {
          const out: Box[] = [];
          for (let y0 = a.top + 4; y0 + h <= a.bottom; y0 += step) {
            for (let k = 0; k <= 8; k++) {
              const x0 = side === "left" ? xv - 6 - w - (k * w) / 4 : xv + 6 + (k * w) / 4;
              if (side === "left" ? x0 < a.left : x0 + w > a.right) break;
              out.push({ x: x0, y: y0, w, h });
            }
          }
          return out;
        };
        // then the whole region, and last the text turned upright in a gap between rules (a phone chart)
        const region = (side: "left" | "right") => (w: number, h: number) => [
          ...within(side)(w, h),
          ...withinRegion(xv, side, w, h, bounds, step),
        ];
        const upright = (side: "left" | "right") => (w: number, h: number) => withinRegion(xv, side, w, h, bounds, step);
        labels.push({
          id: "unstable",
          lines: ["speed-unstable"],
          colour: pal.unstableText,
          weight: 600,
          place: region("left"),
          upright: upright("left"),
        });
        labels.push({
          id: "stable",
          lines: ["speed-stable"],
          colour: pal.stableText,
          weight: 600,
          place: region("right"),
          upright: upright("right"),
        });
      }
      if (!hidden("vmd") && inside(c.vmdMs)) {
        rule(c.vmdMs, [], pal.chalk);
        labels.push({
          id: "vmd",
          lines: [`Vmd ${fmt(speedInUnit(c.vmdMs, unit))} ${u}`, ...(c.flags.vmd ? [`(${c.flags.vmd})`] : [])],
          colour: pal.chalk,
          weight: 600,
          place: topDown(px(c.vmdMs), "both"),
        });
      }
      if (!hidden("vmp") && inside(c.vmpMs)) {
        rule(c.vmpMs, [lw * 3, lw * 2], pal.dim);
        labels.push({
          id: "vmp",
          lines: [`Vmp ${fmt(speedInUnit(c.vmpMs, unit))} ${u}`, ...(c.flags.vmp ? [`(${c.flags.vmp})`] : [])],
          colour: pal.dim,
          weight: 600,
          place: topDown(px(c.vmpMs), "both"),
        });
      }
      // a label on every case, beside its total-drag curve (or its first drawn curve)
      o.frame.cases.forEach((_, ci) => {
        const line = caseLines[ci];
        const name = o.spec.cases[ci]?.label;
        if (!line || !name) return;
        labels.push({
          id: `case-${ci}`,
          lines: [name],
          colour: pal.cases[ci] ?? pal.chalk,
          weight: 600,
          place: (w, h) => nearCurve(line, w, h, 0.8 - ci * 0.12, 6),
        });
      });
      if (!hidden("stall") && inside(c.stallMs)) {
        labels.push({
          id: "stall",
          lines: [`stall ${fmt(speedInUnit(c.stallMs, unit))}`, ...(c.flags.stall ? [`(${c.flags.stall})`] : [])],
          colour: pal.chalk,
          weight: 600,
          place: bottomUp(px(c.stallMs), "both"),
        });
      }
      if (!hidden("chosen") && inside(o.spec.chosenSpeedMs)) {
        rule(o.spec.chosenSpeedMs, [lw, lw * 2], pal.chosen);
        const drag = c.chosenDragN === null ? "" : ` · drag ${fmt(c.chosenDragN)} N`;
        labels.push({
          id: "chosen",
          lines: [`${fmt(speedInUnit(o.spec.chosenSpeedMs, unit))} ${u}${drag}`],
          colour: pal.chosen,
          weight: 600,
          place: topDown(px(o.spec.chosenSpeedMs), "both"),
        });
      }
      // thrust held at the chosen speed: a level line at that speed's drag, per case
      o.thrust.forEach((on, ci) => {
        const cc = o.frame.cases[ci];
        if (!on || !cc || cc.chosenDragN === null) return;
        const yp = y.getPixelForValue(cc.chosenDragN);
        if (yp < a.top || yp > a.bottom) return;
        const colour = pal.cases[ci] ?? pal.chalk;
        ctx.save();
        ctx.strokeStyle = colour;
        ctx.lineWidth = lw;
        ctx.setLineDash([lw * 5, lw * 2, lw, lw * 2]);
        ctx.beginPath();
        ctx.moveTo(a.left, yp);
        ctx.lineTo(a.right, yp);
        ctx.stroke();
        ctx.setLineDash([]);
        // where thrust meets drag: the chosen speed, and the other speed of the same drag (Vmd² / V)
        ctx.fillStyle = colour;
        for (const ms of [o.spec.chosenSpeedMs, (cc.vmdMs * cc.vmdMs) / o.spec.chosenSpeedMs]) {
          if (!inside(ms)) continue;
          ctx.beginPath();
          ctx.arc(px(ms), yp, lw * 2.2, 0, Math.PI * 2);
          ctx.fill();
        }
        ctx.restore();
        const line: Pt[] = [
          { x: a.left, y: yp },
          { x: a.right, y: yp },
        ];
        lines.push(line);
        const name = o.spec.cases[ci]?.label ?? `case ${ci + 1}`;
        labels.push({
          id: `thrust-${ci}`,
          lines: [o.frame.cases.length > 1 ? `thrust held, ${name}` : "thrust held"],
          colour,
          weight: 400,
          place: (w, h) => {
            const out: Box[] = [];
            for (let f = 0.98; f >= 0.02; f -= 0.04) {
              const xp = a.left + f * (a.right - a.left) - w;
              out.push({ x: xp, y: yp - h - 6, w, h }, { x: xp, y: yp + 6, w, h });
            }
            return out;
          },
        });
      });
      if (o.guessMs !== null && inside(o.guessMs)) {
        rule(o.guessMs, [lw * 4, lw * 2, lw, lw * 2], pal.call);
        labels.push({
          id: "call",
          lines: [`your call ${fmt(speedInUnit(o.guessMs, unit))} ${u}`],
          colour: pal.call,
          weight: 600,
          place: topDown(px(o.guessMs), "both"),
        });
      }
      if (o.answerMs !== null && inside(o.answerMs)) {
        rule(o.answerMs, [], pal.answer);
        labels.push({
          id: "answer",
          lines: [`answer ${fmt(speedInUnit(o.answerMs, unit))} ${u}`],
          colour: pal.answer,
          weight: 600,
          place: topDown(px(o.answerMs), "both"),
        });
      }
      if (!hidden("bestGlide") && inside(c.vmdMs)) {
        labels.push({
          id: "glide",
          lines: [`best glide ≈ Vmd, ${fmt(c.maxLiftToDrag, 1)}:1`, ...(c.flags.vmd ? [`(at Vmd: ${c.flags.vmd})`] : [])],
          colour: pal.dim,
          weight: 400,
          place: bottomUp(px(c.vmdMs), "both"),
        });
      }

      // measure, then place; a label that does not fit one line (a narrow phone chart) tries two
      const lineH = Math.round(o.fontPx * 1.2);
      const measured = labels.map((l) => {
        ctx.font = `${l.weight} ${o.fontPx}px sans-serif`;
        const one = l.lines.map((t) => ctx.measureText(t).width);
        const w = Math.ceil(Math.max(...one));
        const candidates = l.place(w, lineH * l.lines.length);
        // the two-line form: after a hyphen ("speed-" / "unstable"), else at the first space ("Vmp" / "53 kt")
        const t0 = l.lines[0]!;
        const split =
          l.lines.length !== 1
            ? null
            : t0.includes("-")
              ? t0.replace("-", "-\n").split("\n")
              : t0.includes(" ")
                ? t0.replace(" ", "\n").split("\n")
                : null;
        const uprightCandidates = l.upright ? l.upright(lineH * l.lines.length, w) : [];
        if (split) {
          const w2 = Math.ceil(Math.max(...split.map((t) => ctx.measureText(t).width)));
          return { l, candidates, split, splitCandidates: l.place(w2, lineH * 2), uprightCandidates };
        }
        return { l, candidates, split: null, splitCandidates: [] as Box[], uprightCandidates };
      });
      const requests: LabelRequest[] = measured.map((m) => ({
        id: m.l.id,
        candidates: [...m.candidates, ...m.splitCandidates, ...m.uprightCandidates],
      }));
      const placed = placeLabels({ labels: requests, lines, bounds, padding: Math.max(2, lw / 2) });
      ctx.save();
      ctx.textBaseline = "top";
      ctx.textAlign = "left";
      const drawn: string[] = [];
      placed.forEach((p, i) => {
        const m = measured[i]!;
        if (!p.box) return;
        ctx.font = `${m.l.weight} ${o.fontPx}px sans-serif`;
        ctx.fillStyle = m.l.colour;
        const pad = Math.round((lineH - o.fontPx) / 2);
        if (p.candidate >= m.candidates.length + m.splitCandidates.length) {
          // upright: turned a quarter anticlockwise, reading upwards from the box's bottom-left corner
          ctx.save();
          ctx.translate(p.box.x, p.box.y + p.box.h);
          ctx.rotate(-Math.PI / 2);
          m.l.lines.forEach((t, row) => ctx.fillText(t, 0, row * lineH + pad));
          ctx.restore();
          drawn.push(m.l.id);
          return;
        }
        const text = p.candidate >= m.candidates.length && m.split ? m.split : m.l.lines;
        text.forEach((t, row) => ctx.fillText(t, p.box!.x, p.box!.y + row * lineH + pad));
        drawn.push(m.l.id);
      });
      ctx.restore();
      chart.canvas.dataset.labels = drawn.join(",");

      // diamond at the bottom of the total-drag bucket, drawn last so it sits on the curve
      if (!hidden("vmd") && inside(c.vmdMs)) {
        const xp = px(c.vmdMs);
        const yp = Math.min(a.bottom, Math.max(a.top, y.getPixelForValue(c.minDragN)));
        const r = lw * 3;
        ctx.save();
        ctx.fillStyle = pal.chalk;
        ctx.strokeStyle = pal.bg;
        ctx.lineWidth = 2;
        ctx.beginPath();
        ctx.moveTo(xp, yp - r);
        ctx.lineTo(xp + r, yp);
        ctx.lineTo(xp, yp + r);
        ctx.lineTo(xp - r, yp);
        ctx.closePath();
        ctx.fill();
        ctx.stroke();
        ctx.restore();
      }
    },
    afterRender(chart) {
      // Counters the bench and the tests read: one redraw per slider input, same instance.
      const canvas = chart.canvas;
      canvas.dataset.renders = String(Number(canvas.dataset.renders ?? "0") + 1);
      canvas.dataset.chartId = String(chart.id);
      canvas.dataset.points = chart.data.datasets.map((d) => d.data.length).join(",");
    },
  };
}

function axisTitle(spec: DemoSpec): string {
  return `${spec.axis.speed === "true" ? "TAS" : "EAS (= IAS = CAS here)"} (${speedUnitLabel(spec.axis.unit)})`;
}

function effectiveSpec(spec: DemoSpec, conceal: Concealment | null): DemoSpec {
  if (!conceal || conceal.curves.length === 0) return spec;
  const curves = { ...spec.curves };
  for (const k of conceal.curves) curves[k] = false;
  return { ...spec, curves };
}

interface ApplyInput {
  spec: DemoSpec;
  focus: number;
  conceal: Concealment | null;
  guessMs: number | null;
  answerMs: number | null;
  thrust: boolean[];
}

/** Draws the chart, as it stands, into a box of another canvas (the PNG export), on the board or on paper. */
export type ChartExporter = (
  ctx: CanvasRenderingContext2D,
  box: Box,
  options: { light: boolean; fontPx: number; lineWidth: number },
) => void;

function chartOptions(frame: Frame, spec: DemoSpec, pal: Palette, fontPx: number, thickGrid: boolean) {
  const tick = { color: pal.dim, font: { size: fontPx } };
  const title = (text: string) => ({ display: true, text, color: pal.chalk, font: { size: fontPx, weight: 600 as const } });
  const grid = { color: pal.grid, lineWidth: thickGrid ? 1.5 : 1 };
  return {
    scales: {
      x: { type: "linear" as const, min: frame.xMin, max: frame.xMax, ticks: tick, grid, title: title(axisTitle(spec)) },
      y: { type: "linear" as const, position: "left" as const, min: 0, max: frame.yMaxDragN, ticks: tick, grid, title: title("Drag (N)") },
    },
    power: {
      type: "linear",
      position: "right",
      min: 0,
      max: frame.yMaxPowerKw,
      ticks: tick,
      grid: { drawOnChartArea: false },
      title: title("Power required (kW)"),
    },
    ld: {
      type: "linear",
      position: "right",
      min: 0,
      max: frame.yMaxLiftToDrag,
      ticks: tick,
      grid: { drawOnChartArea: false },
      title: title("L/D"),
    },
  };
}

/**
 * Owns everything the one chart instance draws from: the preallocated points, the library's
 * reusable arrays, the plugin's overlay and the chart's configuration. `apply` rewrites them in
 * place and redraws once with update("none").
 */
class CurveChartController {
  readonly frame: Frame;
  readonly cache: { set?: CurveSet<Float64Array> } = {};
  readonly overlay: { current: Overlay };
  /** All 28 datasets (four cases x seven curves); the chart holds only the visible ones, so it never updates points it does not draw. */
  readonly all: ChartDataset<"line", { x: number; y: number }[]>[];
  readonly data: { datasets: ChartDataset<"line", { x: number; y: number }[]>[] };
  readonly options: ChartOptions<"line">;
  readonly plugins: Plugin<"line">[];
  private pick: ((ms: number) => void) | undefined;
  private readonly extraScales: { power: { max: number } & Record<string, unknown>; ld: { max: number } & Record<string, unknown> };

  constructor(
    first: ApplyInput,
    readonly variant: ChartVariant,
  ) {
    const projector = variant === "projector";
    const fontPx = projector ? 28 : 13;
    const lineWidth = projector ? 4 : 2.5;
    const frame = fillFrame(newFrame(), effectiveSpec(first.spec, first.conceal), this.cache);
    this.frame = frame;
    this.overlay = { current: { ...first, frame, fontPx, lineWidth, palette: BOARD_PALETTE } };
    const datasets: ChartDataset<"line", { x: number; y: number }[]>[] = [];
    for (let c = 0; c < MAX_CASES; c++) {
      for (const k of CURVE_KEYS) {
        const d = datasetIndex(c, k);
        datasets.push({
          label: `${CURVE_LABELS[k]}, case ${c + 1}`,
          data: frame.points[d]!,
          parsing: false,
          normalized: true,
          borderColor: CASE_COLOURS[c],
          backgroundColor: CASE_COLOURS[c],
          borderWidth: k === "total" ? lineWidth + 1 : lineWidth,
          borderDash: CURVE_DASH[k].map((v) => v * (projector ? 1.6 : 1)),
          pointRadius: 0,
          pointHoverRadius: 0,
          tension: 0,
          spanGaps: true,
          yAxisID: k === "power" ? "power" : k === "liftToDrag" ? "ld" : "y",
        });
      }
    }
    const built = chartOptions(frame, first.spec, BOARD_PALETTE, fontPx, projector);
    this.all = datasets;
    this.data = { datasets: datasets.filter((_, d) => frame.visible[d]) };
    this.options = {
      animation: false,
      responsive: true,
      maintainAspectRatio: false,
      events: ["click"],
      plugins: { legend: { display: false }, tooltip: { enabled: false } },
      onClick: (e, _els, ch) => {
        const xScale = ch.scales.x;
        if (!xScale || e.x === null || e.x === undefined) return;
        const v = xScale.getValueForPixel(e.x);
        if (v !== undefined && Number.isFinite(v) && v > 0) this.pick?.(speedFromUnit(v, this.overlay.current.spec.axis.unit));
      },
      scales: built.scales,
    };
    // The power and L/D axes exist only while a curve uses them (a chart.js scale costs time on every update even when hidden).
    this.extraScales = { power: built.power, ld: built.ld };
    const scales = this.options.scales as Record<string, unknown>;
    if (frame.visible.some((v, d) => v && d % CURVE_KEYS.length === CURVE_KEYS.indexOf("power"))) scales.power = this.extraScales.power;
    if (frame.visible.some((v, d) => v && d % CURVE_KEYS.length === CURVE_KEYS.indexOf("liftToDrag"))) scales.ld = this.extraScales.ld;
    this.plugins = [boardPlugin(this.overlay)];
  }

  setPick(fn: ((ms: number) => void) | undefined): void {
    this.pick = fn;
  }

  /**
   * The PNG export: a second, short-lived chart.js instance on an offscreen canvas of the export's
   * size, drawn from the same frame with the chosen palette, copied into the target and destroyed.
   */
  readonly exporter: ChartExporter = (target, box, { light, fontPx, lineWidth }) => {
    const pal = light ? PAPER_PALETTE : BOARD_PALETTE;
    const frame = this.frame;
    const spec = this.overlay.current.spec;
    const canvas = document.createElement("canvas");
    canvas.width = Math.round(box.w);
    canvas.height = Math.round(box.h);
    const datasets: ChartDataset<"line", { x: number; y: number }[]>[] = [];
    this.all.forEach((ds, d) => {
      if (!frame.visible[d]) return;
      const k = CURVE_KEYS[d % CURVE_KEYS.length]!;
      const colour = pal.cases[Math.floor(d / CURVE_KEYS.length)] ?? pal.chalk;
      datasets.push({
        ...ds,
        borderColor: colour,
        backgroundColor: colour,
        borderWidth: k === "total" ? lineWidth + 1 : lineWidth,
        borderDash: CURVE_DASH[k].map((v) => v * (lineWidth / 2.5)),
      });
    });
    const built = chartOptions(frame, spec, pal, fontPx, true);
    const scales: Record<string, unknown> = { ...built.scales };
    if (datasets.some((d) => d.yAxisID === "power")) scales.power = built.power;
    if (datasets.some((d) => d.yAxisID === "ld")) scales.ld = built.ld;
    const overlay = { current: { ...this.overlay.current, palette: pal, fontPx, lineWidth } };
    const ch = new ChartJS(canvas, {
      type: "line",
      data: { datasets },
      options: {
        animation: false,
        responsive: false,
        devicePixelRatio: 1,
        events: [],
        plugins: { legend: { display: false }, tooltip: { enabled: false } },
        scales: scales as ChartOptions<"line">["scales"],
      },
      plugins: [boardPlugin(overlay)],
    });
    try {
      target.drawImage(canvas, box.x, box.y, box.w, box.h);
    } finally {
      ch.destroy();
    }
  };

  apply(ch: Chart<"line", { x: number; y: number }[]>, input: ApplyInput): void {
    const eff = effectiveSpec(input.spec, input.conceal);
    const frame = fillFrame(this.frame, eff, this.cache);
    this.overlay.current = { ...this.overlay.current, ...input, spec: eff, frame };
    // Swap datasets in or out only when the set of drawn curves changes (a toggle, a case added).
    const held = ch.data.datasets;
    let power = false;
    let ld = false;
    let n = 0;
    let same = true;
    for (let d = 0; d < this.all.length; d++) {
      if (!frame.visible[d]) continue;
      if (held[n] !== this.all[d]) same = false;
      n++;
      if (d % CURVE_KEYS.length === CURVE_KEYS.indexOf("power")) power = true;
      if (d % CURVE_KEYS.length === CURVE_KEYS.indexOf("liftToDrag")) ld = true;
    }
    if (!same || held.length !== n) {
      held.length = 0;
      for (let d = 0; d < this.all.length; d++) if (frame.visible[d]) held.push(this.all[d]!);
    }
    // The chart's own stored options (chart.js keeps a merged copy of what it was given);
    // update() merges and resolves them again.
    const scales = (ch.config.options as ChartOptions<"line">).scales as Record<
      string,
      { min?: number; max?: number; display?: boolean; title?: { text?: string } }
    >;
    scales.x!.min = frame.xMin;
    scales.x!.max = frame.xMax;
    scales.x!.title!.text = axisTitle(eff);
    scales.y!.max = frame.yMaxDragN;
    this.extraScales.power.max = frame.yMaxPowerKw;
    this.extraScales.ld.max = frame.yMaxLiftToDrag;
    if (power) scales.power = { ...(scales.power ?? this.extraScales.power), max: frame.yMaxPowerKw };
    else delete scales.power;
    if (ld) scales.ld = { ...(scales.ld ?? this.extraScales.ld), max: frame.yMaxLiftToDrag };
    else delete scales.ld;
    ch.update("none");
  }
}

const NO_THRUST: boolean[] = [];

function CurveChartInner({
  spec,
  focus,
  variant,
  conceal = null,
  guessMs = null,
  answerMs = null,
  thrust = NO_THRUST,
  onPickSpeed,
  chartRef,
  exportRef,
  label,
  className,
}: CurveChartProps) {
  const chart = useRef<Chart<"line", { x: number; y: number }[]> | null>(null);
  // One controller for the component's life: the chart instance is never recreated.
  const [ctl] = useState(() => new CurveChartController({ spec, focus, conceal, guessMs, answerMs, thrust }, variant));
  useEffect(() => ctl.setPick(onPickSpeed), [ctl, onPickSpeed]);
  useEffect(() => {
    if (!exportRef) return;
    exportRef.current = ctl.exporter;
    return () => {
      exportRef.current = null;
    };
  }, [ctl, exportRef]);
  useLayoutEffect(() => {
    const ch = chart.current;
    if (ch) ctl.apply(ch, { spec, focus, conceal, guessMs, answerMs, thrust });
  }, [ctl, spec, focus, conceal, guessMs, answerMs, thrust]);
  // react-chartjs-2 creates the chart in an effect and then calls this ref: hand the one
  // instance to the caller (PNG export, tests) as soon as it exists.
  const setChart = useCallback(
    (instance: Chart<"line", { x: number; y: number }[]> | null | undefined) => {
      chart.current = instance ?? null;
      if (chartRef) chartRef.current = (instance ?? null) as unknown as Chart | null;
    },
    [chartRef],
  );

  return (
    <div className={className} style={{ position: "relative" }}>
      <ReactChart
        ref={setChart}
        type="line"
        data={ctl.data}
        options={ctl.options}
        plugins={ctl.plugins}
        role="img"
        aria-label={label}
        data-testid="curve-chart"
      />
    </div>
  );
}

/** The drag chart: one chart.js instance for the component's life, redrawn in place on every change. */
export const CurveChart = memo(CurveChartInner);
