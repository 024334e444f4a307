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
  /** receives the one chart instance (for PNG export and the bench) */
  chartRef?: MutableRefObject<Chart | null>;
  label: string;
  className?: string;
}

let hatch: CanvasPattern | null = null;
function hatchPattern(ctx: CanvasRenderingContext2D): CanvasPattern | null {
  if (hatch || typeof document === "undefined") return hatch;
  const c = document.createElement("canvas");
  c.width = 12;
  c.height = 12;
  const g = c.getContext("2d");
  if (!g) return null;
  g.strokeStyle = "rgba(244,241,232,0.45)";
  g.lineWidth = 2;
  g.beginPath();
  g.moveTo(0, 12);
  g.lineTo(12, 0);
  g.moveTo(-3, 3);
  g.lineTo(3, -3);
  g.moveTo(9, 15);
  g.lineTo(15, 9);
  g.stroke();
  hatch = ctx.createPattern(c, "repeat");
  return hatch;
}

function fmt(n: number, digits = 0): string {
  return formatNumber(n, digits);
}

/**
 * The board plugin: background, speed-stability regions either side of the focused case's Vmd
 * (amber "speed-unstable" below, teal "speed-stable" above), stall hatched, Vmd as a solid rule
 * with a diamond at minimum drag, Vmp dashed, best glide, the chosen speed and the student's call.
 */
function boardPlugin(overlay: { current: Overlay }): Plugin<"line"> {
  return {
    id: "curveLabBoard",
    beforeDraw(chart) {
      const { ctx, width, height } = chart;
      ctx.save();
      ctx.fillStyle = BOARD.bg;
      ctx.fillRect(0, 0, width, height);
      ctx.restore();
    },
    beforeDatasetsDraw(chart) {
      const o = overlay.current;
      const c = o.frame.cases[o.focus] ?? o.frame.cases[0];
      if (!c) return;
      const { ctx, chartArea: a } = chart;
      const x = chart.scales.x!;
      const unit = o.spec.axis.unit;
      const px = (ms: number) => Math.min(a.right, Math.max(a.left, x.getPixelForValue(speedInUnit(ms, unit))));
      const conceal = o.conceal;
      ctx.save();
      ctx.font = `600 ${o.fontPx}px sans-serif`;
      ctx.textBaseline = "top";
      if (!conceal?.regions) {
        const xv = px(c.vmdMs);
        ctx.fillStyle = "rgba(212,138,22,0.20)";
        ctx.fillRect(a.left, a.top, xv - a.left, a.bottom - a.top);
        ctx.fillStyle = "rgba(31,156,140,0.20)";
        ctx.fillRect(xv, a.top, a.right - xv, a.bottom - a.top);
        ctx.fillStyle = "#f2c27a";
        ctx.textAlign = "right";
        if (xv - a.left > o.fontPx * 6) ctx.fillText("speed-unstable", xv - 8, a.top + 6);
        ctx.fillStyle = "#8fe0d4";
        ctx.textAlign = "left";
        if (a.right - xv > o.fontPx * 6) ctx.fillText("speed-stable", xv + 8, a.top + 6);
      }
      if (o.spec.markers.stall && !conceal?.markers.includes("stall")) {
        const xs = px(c.stallMs);
        const pattern = hatchPattern(ctx);
        if (pattern && xs > a.left) {
          ctx.fillStyle = pattern;
          ctx.fillRect(a.left, a.top, xs - a.left, a.bottom - a.top);
        }
        ctx.fillStyle = BOARD.chalk;
        ctx.textAlign = "left";
        ctx.textBaseline = "bottom";
        if (xs > a.left) ctx.fillText(`stall ${fmt(speedInUnit(c.stallMs, unit))}`, Math.max(a.left + 4, xs - o.fontPx * 5), a.bottom - 6);
      }
      ctx.restore();
    },
    afterDatasetsDraw(chart) {
      const o = overlay.current;
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
      const rule = (ms: number, dash: number[], colour: string, text: string, row: number) => {
        const xp = px(ms);
        ctx.save();
        ctx.strokeStyle = colour;
        ctx.lineWidth = lw;
        ctx.setLineDash(dash);
        ctx.beginPath();
        ctx.moveTo(xp, a.top);
        ctx.lineTo(xp, a.bottom);
        ctx.stroke();
        ctx.setLineDash([]);
        ctx.font = `600 ${o.fontPx}px sans-serif`;
        ctx.fillStyle = colour;
        ctx.textBaseline = "top";
        const w = ctx.measureText(text).width;
        const tx = xp + 6 + w > a.right ? xp - 6 - w : xp + 6;
        ctx.fillText(text, tx, a.top + 6 + row * (o.fontPx + 8));
        ctx.restore();
      };
      if (!hidden("vmp") && inside(c.vmpMs)) rule(c.vmpMs, [lw * 3, lw * 2], BOARD.dim, `Vmp ${fmt(speedInUnit(c.vmpMs, unit))} ${u}`, 2);
      if (!hidden("vmd") && inside(c.vmdMs)) {
        rule(c.vmdMs, [], BOARD.chalk, `Vmd ${fmt(speedInUnit(c.vmdMs, unit))} ${u}`, 1);
        // diamond at the bottom of the total-drag bucket
        const xp = px(c.vmdMs);
        const yp = Math.min(a.bottom, Math.max(a.top, y.getPixelForValue(c.minDragN)));
        const r = lw * 3;
        ctx.save();
        ctx.fillStyle = BOARD.chalk;
        ctx.strokeStyle = BOARD.bg;
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
      if (!hidden("bestGlide") && inside(c.vmdMs)) {
        const xp = px(c.vmdMs);
        ctx.save();
        ctx.font = `${o.fontPx}px sans-serif`;
        ctx.fillStyle = BOARD.dim;
        ctx.textBaseline = "bottom";
        ctx.fillText(`best glide ≈ Vmd, ${fmt(c.maxLiftToDrag, 1)}:1`, xp + 6, a.bottom - o.fontPx - 14);
        ctx.restore();
      }
      if (!hidden("chosen") && inside(o.spec.chosenSpeedMs)) {
        const drag = c.chosenDragN === null ? "" : ` · drag ${fmt(c.chosenDragN)} N`;
        rule(o.spec.chosenSpeedMs, [lw, lw * 2], "#c8f07a", `${fmt(speedInUnit(o.spec.chosenSpeedMs, unit))} ${u}${drag}`, 3);
      }
      if (o.guessMs !== null && inside(o.guessMs))
        rule(o.guessMs, [lw * 4, lw * 2, lw, lw * 2], "#ffb3c7", `your call ${fmt(speedInUnit(o.guessMs, unit))} ${u}`, 4);
      if (o.answerMs !== null && inside(o.answerMs))
        rule(o.answerMs, [], "#7fd1ff", `answer ${fmt(speedInUnit(o.answerMs, unit))} ${u}`, 5);
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
    this.overlay = { current: { ...first, frame, fontPx, lineWidth } };
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
    const tick = { color: BOARD.dim, font: { size: fontPx } };
    const title = (text: string) => ({ display: true, text, color: BOARD.chalk, font: { size: fontPx, weight: 600 as const } });
    const grid = { color: BOARD.grid, lineWidth: projector ? 1.5 : 1 };
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
      scales: {
        x: { type: "linear", min: frame.xMin, max: frame.xMax, ticks: tick, grid, title: title(axisTitle(first.spec)) },
        y: { type: "linear", position: "left", min: 0, max: frame.yMaxDragN, ticks: tick, grid, title: title("Drag (N)") },
      },
    };
    // The power and L/D axes exist only while a curve uses them (a chart.js scale costs time on every update even when hidden).
    this.extraScales = {
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
    const scales = this.options.scales as Record<string, unknown>;
    if (frame.visible.some((v, d) => v && d % CURVE_KEYS.length === CURVE_KEYS.indexOf("power"))) scales.power = this.extraScales.power;
    if (frame.visible.some((v, d) => v && d % CURVE_KEYS.length === CURVE_KEYS.indexOf("liftToDrag"))) scales.ld = this.extraScales.ld;
    this.plugins = [boardPlugin(this.overlay)];
  }

  setPick(fn: ((ms: number) => void) | undefined): void {
    this.pick = fn;
  }

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

function CurveChartInner({
  spec,
  focus,
  variant,
  conceal = null,
  guessMs = null,
  answerMs = null,
  onPickSpeed,
  chartRef,
  label,
  className,
}: CurveChartProps) {
  const chart = useRef<Chart<"line", { x: number; y: number }[]> | null>(null);
  // One controller for the component's life: the chart instance is never recreated.
  const [ctl] = useState(() => new CurveChartController({ spec, focus, conceal, guessMs, answerMs }, variant));
  useEffect(() => ctl.setPick(onPickSpeed), [ctl, onPickSpeed]);
  useLayoutEffect(() => {
    const ch = chart.current;
    if (ch) ctl.apply(ch, { spec, focus, conceal, guessMs, answerMs });
  }, [ctl, spec, focus, conceal, guessMs, answerMs]);
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
