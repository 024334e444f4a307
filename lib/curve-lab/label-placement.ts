/**
 * Chart label placement: each label has candidate positions in order of preference; it takes the
 * first one that stays inside the plot, clears every label already placed and every drawn line
 * (sampled curves and marker rules, as polylines). Pure and framework-free, in canvas pixels
 * (y grows downwards), so the chart and its tests share it.
 */

export interface Box {
  x: number;
  y: number;
  w: number;
  h: number;
}

export interface Pt {
  x: number;
  y: number;
}

export interface LabelRequest {
  id: string;
  /** candidate boxes (top-left corner and size), best first */
  candidates: Box[];
}

export interface Placement {
  id: string;
  /** the chosen box, or null when every candidate was blocked (the label is left out) */
  box: Box | null;
  /** index of the chosen candidate */
  candidate: number;
}

export interface PlacementInput {
  labels: LabelRequest[];
  /** drawn lines: curves (sampled points in pixels) and rules (two points) */
  lines: Pt[][];
  /** the plot area every label must stay inside */
  bounds: Box;
  /** clear space kept around each label, px */
  padding?: number;
}

function inside(b: Box, bounds: Box): boolean {
  return b.x >= bounds.x && b.y >= bounds.y && b.x + b.w <= bounds.x + bounds.w && b.y + b.h <= bounds.y + bounds.h;
}

export function boxesOverlap(a: Box, b: Box): boolean {
  return a.x < b.x + b.w && b.x < a.x + a.w && a.y < b.y + b.h && b.y < a.y + a.h;
}

/** Whether the segment p-q passes through the box (Liang-Barsky clipping). */
export function segmentHitsBox(p: Pt, q: Pt, b: Box): boolean {
  if (!Number.isFinite(p.x) || !Number.isFinite(p.y) || !Number.isFinite(q.x) || !Number.isFinite(q.y)) return false;
  const x0 = b.x;
  const x1 = b.x + b.w;
  const y0 = b.y;
  const y1 = b.y + b.h;
  // quick rejects: both ends on one side
  if ((p.x < x0 && q.x < x0) || (p.x > x1 && q.x > x1) || (p.y < y0 && q.y < y0) || (p.y > y1 && q.y > y1)) return false;
  const dx = q.x - p.x;
  const dy = q.y - p.y;
  let t0 = 0;
  let t1 = 1;
  const edges: [number, number][] = [
    [-dx, p.x - x0],
    [dx, x1 - p.x],
    [-dy, p.y - y0],
    [dy, y1 - p.y],
  ];
  for (const [pe, qe] of edges) {
    if (pe === 0) {
      if (qe < 0) return false;
      continue;
    }
    const r = qe / pe;
    if (pe < 0) {
      if (r > t1) return false;
      if (r > t0) t0 = r;
    } else {
      if (r < t0) return false;
      if (r < t1) t1 = r;
    }
  }
  return t0 <= t1;
}

export function lineHitsBox(line: Pt[], b: Box, xSorted = false): boolean {
  if (line.length === 1) {
    const p = line[0]!;
    return p.x >= b.x && p.x <= b.x + b.w && p.y >= b.y && p.y <= b.y + b.h;
  }
  let from = 1;
  const to = line.length;
  if (xSorted) {
    // a curve sampled left to right: only the segments over the box's columns can cross it
    let lo = 0;
    let hi = line.length - 1;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (line[mid]!.x < b.x) lo = mid + 1;
      else hi = mid;
    }
    from = Math.max(1, lo);
  }
  for (let i = from; i < to; i++) {
    if (xSorted && line[i - 1]!.x > b.x + b.w) break;
    if (segmentHitsBox(line[i - 1]!, line[i]!, b)) return true;
  }
  return false;
}

function isXSorted(line: Pt[]): boolean {
  for (let i = 1; i < line.length; i++) if (!(line[i]!.x >= line[i - 1]!.x)) return false;
  return true;
}

function grow(b: Box, by: number): Box {
  return { x: b.x - by, y: b.y - by, w: b.w + 2 * by, h: b.h + 2 * by };
}

/** Places the labels in the order given (earlier labels win the better spots). */
export function placeLabels({ labels, lines, bounds, padding = 3 }: PlacementInput): Placement[] {
  const taken: Box[] = [];
  const sorted = lines.map(isXSorted);
  return labels.map((label) => {
    for (let i = 0; i < label.candidates.length; i++) {
      const b = label.candidates[i]!;
      if (!inside(b, bounds)) continue;
      const clear = grow(b, padding);
      if (taken.some((t) => boxesOverlap(clear, t))) continue;
      if (lines.some((l, k) => lineHitsBox(l, clear, sorted[k]))) continue;
      taken.push(b);
      return { id: label.id, box: b, candidate: i };
    }
    return { id: label.id, box: null, candidate: -1 };
  });
}

/**
 * Candidates beside a vertical rule at x: right of it, then left of it, on successive rows from
 * the top of the plot downwards.
 */
export function besideRule(x: number, w: number, h: number, bounds: Box, gap = 6, rowStep = h + 4): Box[] {
  const out: Box[] = [];
  for (let y = bounds.y + 4; y + h <= bounds.y + bounds.h; y += rowStep) {
    out.push({ x: x + gap, y, w, h }, { x: x - gap - w, y, w, h });
  }
  return out;
}

/**
 * Candidates near a curve: above-left, above-right, below-right, below-left of sampled points,
 * walking from `from` (a fraction of the way along the curve) outwards in both directions.
 */
export function nearCurve(points: Pt[], w: number, h: number, from = 0.85, gap = 6): Box[] {
  const n = points.length;
  if (n === 0) return [];
  const start = Math.min(n - 1, Math.max(0, Math.round(from * (n - 1))));
  const step = Math.max(1, Math.round(n / 40));
  const order: number[] = [start];
  for (let k = step; k < n; k += step) {
    if (start + k < n) order.push(start + k);
    if (start - k >= 0) order.push(start - k);
  }
  const out: Box[] = [];
  for (const i of order) {
    const p = points[i]!;
    if (!Number.isFinite(p.x) || !Number.isFinite(p.y)) continue;
    out.push(
      { x: p.x - w - gap, y: p.y - h - gap, w, h },
      { x: p.x + gap, y: p.y - h - gap, w, h },
      { x: p.x + gap, y: p.y + gap, w, h },
      { x: p.x - w - gap, y: p.y + gap, w, h },
    );
  }
  return out;
}

/**
 * Candidates anywhere on one side of a vertical boundary at `edge` (a region of the chart, e.g.
 * left of Vmd), rows from the top of the plot down, and on each row from the boundary outwards in
 * steps of `step` px up to the plot's edge: on a narrow phone chart, where rules split the region,
 * the label still finds the gap between them.
 */
export function withinRegion(edge: number, side: "left" | "right", w: number, h: number, bounds: Box, step: number, gap = 6): Box[] {
  const out: Box[] = [];
  const s = Math.max(1, step);
  for (let y = bounds.y + 4; y + h <= bounds.y + bounds.h; y += s) {
    for (let k = 0; ; k++) {
      const x = side === "left" ? edge - gap - w - k * s : edge + gap + k * s;
      if (side === "left" ? x < bounds.x : x + w > bounds.x + bounds.w) break;
      out.push({ x, y, w, h });
    }
  }
  return out;
}
