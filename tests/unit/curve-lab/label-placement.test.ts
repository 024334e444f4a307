import {
  besideRule,
  boxesOverlap,
  lineHitsBox,
  nearCurve,
  placeLabels,
  segmentHitsBox,
  withinRegion,
  type Box,
  type Pt,
} from "@/lib/curve-lab/label-placement";

const plot: Box = { x: 0, y: 0, w: 800, h: 400 };

describe("chart label placement", () => {
  it("a segment through a box hits it; one passing beside it or ending short does not", () => {
    const b: Box = { x: 10, y: 10, w: 20, h: 10 };
    expect(segmentHitsBox({ x: 0, y: 15 }, { x: 40, y: 15 }, b)).toBe(true); // straight through
    expect(segmentHitsBox({ x: 0, y: 0 }, { x: 40, y: 30 }, b)).toBe(true); // diagonal through
    expect(segmentHitsBox({ x: 0, y: 0 }, { x: 40, y: 5 }, b)).toBe(false); // above
    expect(segmentHitsBox({ x: 0, y: 15 }, { x: 8, y: 15 }, b)).toBe(false); // ends before it
    expect(segmentHitsBox({ x: 0, y: 18 }, { x: 18, y: 0 }, b)).toBe(false); // passes just outside the corner (10, 10)
    expect(segmentHitsBox({ x: 0, y: 22 }, { x: 22, y: 0 }, b)).toBe(true); // clips the corner
  });

  it("a vertical rule running through the first spot pushes the label to the next (Vmd's rule never runs through Vmp's text)", () => {
    const vmdRule: Pt[] = [
      { x: 300, y: 0 },
      { x: 300, y: 400 },
    ];
    const vmp = {
      id: "vmp",
      candidates: [
        { x: 260, y: 10, w: 90, h: 20 },
        { x: 200, y: 10, w: 90, h: 20 },
      ],
    };
    const [p] = placeLabels({ labels: [vmp], lines: [vmdRule], bounds: plot });
    expect(p!.candidate).toBe(1);
    expect(lineHitsBox(vmdRule, p!.box!)).toBe(false);
  });

  it("a label never sits on a curve: the stall label moves off the sampled curve to a clear candidate", () => {
    const curve: Pt[] = [];
    for (let i = 0; i <= 100; i++) curve.push({ x: i * 8, y: 380 - i * 3 });
    const stall = {
      id: "stall",
      candidates: [
        { x: 20, y: 350, w: 80, h: 20 },
        { x: 100, y: 360, w: 80, h: 20 },
      ],
    };
    const [p] = placeLabels({ labels: [stall], lines: [curve], bounds: plot });
    expect(p!.candidate).toBe(1);
    expect(lineHitsBox(curve, p!.box!)).toBe(false);
  });

  it("two labels wanting the same spot: the first keeps it, the second takes its next clear candidate", () => {
    const spot = { x: 100, y: 100, w: 60, h: 20 };
    const r = placeLabels({
      labels: [
        { id: "a", candidates: [spot] },
        { id: "b", candidates: [spot, { x: 100, y: 110, w: 60, h: 20 }, { x: 100, y: 140, w: 60, h: 20 }] },
      ],
      lines: [],
      bounds: plot,
    });
    expect(r.map((p) => p.candidate)).toEqual([0, 2]);
    expect(boxesOverlap(r[0]!.box!, r[1]!.box!)).toBe(false);
  });

  it("a candidate outside the plot is skipped, and a label with no clear candidate is left out, not drawn on top", () => {
    const r = placeLabels({
      labels: [
        {
          id: "a",
          candidates: [
            { x: 790, y: 10, w: 60, h: 20 },
            { x: 700, y: 10, w: 60, h: 20 },
          ],
        },
        { id: "b", candidates: [{ x: 700, y: 10, w: 60, h: 20 }] },
      ],
      lines: [],
      bounds: plot,
    });
    expect(r[0]).toMatchObject({ candidate: 1 });
    expect(r[1]).toEqual({ id: "b", box: null, candidate: -1 });
  });

  it("the column search over a left-to-right curve answers as the full scan does", () => {
    const curve: Pt[] = [];
    for (let i = 0; i < 400; i++) curve.push({ x: 10 + i * 2, y: 200 + 150 * Math.sin(i / 17) });
    let seed = 3;
    const rnd = () => (seed = (seed * 16807) % 2147483647) / 2147483647;
    for (let k = 0; k < 2000; k++) {
      const b: Box = { x: rnd() * 820 - 10, y: rnd() * 400, w: 5 + rnd() * 120, h: 5 + rnd() * 40 };
      expect(lineHitsBox(curve, b, true)).toBe(lineHitsBox(curve, b, false));
    }
  });

  it("on many random charts no two placed labels overlap and none touches a line", () => {
    let seed = 7;
    const rnd = () => (seed = (seed * 16807) % 2147483647) / 2147483647;
    for (let chart = 0; chart < 60; chart++) {
      const lines: Pt[][] = [];
      for (let c = 0; c < 3; c++) {
        const a = 50 + rnd() * 300;
        const vmd = 200 + rnd() * 300;
        const pts: Pt[] = [];
        for (let i = 0; i < 200; i++) {
          const x = 20 + i * 4;
          pts.push({ x, y: 380 - a * (x / vmd) ** 2 * 0.5 - (a * 0.5 * vmd * vmd) / (x * x) + a });
        }
        lines.push(pts);
      }
      const rx = 100 + rnd() * 600;
      lines.push([
        { x: rx, y: 0 },
        { x: rx, y: 400 },
      ]);
      const labels = [
        { id: "rule", candidates: besideRule(rx, 90, 22, plot) },
        ...lines.slice(0, 3).map((l, i) => ({ id: `case${i}`, candidates: nearCurve(l, 70, 22) })),
      ];
      const placed = placeLabels({ labels, lines, bounds: plot }).filter((p) => p.box);
      for (const p of placed) {
        for (const l of lines) expect(lineHitsBox(l, p.box!)).toBe(false);
        for (const q of placed) if (q !== p) expect(boxesOverlap(p.box!, q.box!)).toBe(false);
      }
      expect(placed.length).toBeGreaterThan(0);
    }
  });

  describe("on a phone-sized chart (390 px screen: a plot about 295 x 260 px, 40 to 150 kt, 0 to 1,600 N)", () => {
    // the seeded bucket demo's shape: Vmd 70 kt, Vmp 53 kt, minimum drag 600 N split evenly
    const phone: Box = { x: 45, y: 8, w: 295, h: 260 };
    const xOf = (kt: number) => phone.x + ((kt - 40) * phone.w) / 110;
    const yOf = (n: number) => phone.y + phone.h * (1 - n / 1600);
    const curve = (drag: (kt: number) => number): Pt[] => {
      const out: Pt[] = [];
      for (let kt = 40; kt <= 150; kt += 0.5) out.push({ x: xOf(kt), y: Math.max(phone.y, yOf(drag(kt))) });
      return out;
    };
    const zeroLift = curve((kt) => 300 * (kt / 70) ** 2);
    const liftDependent = curve((kt) => 300 * (70 / kt) ** 2);
    const total = curve((kt) => 300 * (kt / 70) ** 2 + 300 * (70 / kt) ** 2);
    const rule = (kt: number): Pt[] => [
      { x: xOf(kt), y: phone.y },
      { x: xOf(kt), y: phone.y + phone.h },
    ];
    const lines = [zeroLift, liftDependent, total, rule(70), rule(53)];
    const vmd = xOf(70);
    // "speed-unstable" in 13 px semi-bold is about 100 px long, its two-line form ("speed-" / "unstable") about 58 px wide
    const lineH = 16;
    const step = 13 * 0.6;

    it("level text finds no gap left of Vmd: the Vmp rule splits the region into strips narrower than the label (the label went missing)", () => {
      const level = [...withinRegion(vmd, "left", 100, lineH, phone, step), ...withinRegion(vmd, "left", 58, lineH * 2, phone, step)];
      const [p] = placeLabels({ labels: [{ id: "unstable", candidates: level }], lines, bounds: phone, padding: 2 });
      expect(p!.box).toBeNull();
    });

    it("turned upright, the label fits between the Vmp and Vmd rules above the curves, left of Vmd and clear of every line", () => {
      const level = withinRegion(vmd, "left", 100, lineH, phone, step);
      const upright = withinRegion(vmd, "left", lineH, 100, phone, step);
      const [p] = placeLabels({
        labels: [{ id: "unstable", candidates: [...level, ...upright] }],
        lines,
        bounds: phone,
        padding: 2,
      });
      expect(p!.box).not.toBeNull();
      expect(p!.candidate).toBeGreaterThanOrEqual(level.length);
      expect(p!.box!.x + p!.box!.w).toBeLessThan(vmd);
      for (const l of lines) expect(lineHitsBox(l, p!.box!)).toBe(false);
    });
  });

  it("region candidates stay on their own side of the boundary and inside the plot, nearest the boundary first", () => {
    const left = withinRegion(300, "left", 50, 20, plot, 10);
    const right = withinRegion(300, "right", 50, 20, plot, 10);
    expect(left.length).toBeGreaterThan(0);
    expect(right.length).toBeGreaterThan(0);
    for (const b of left) expect(b.x + b.w).toBeLessThanOrEqual(300 - 6);
    for (const b of left) expect(b.x).toBeGreaterThanOrEqual(plot.x);
    for (const b of right) expect(b.x).toBeGreaterThanOrEqual(300 + 6);
    for (const b of right) expect(b.x + b.w).toBeLessThanOrEqual(plot.x + plot.w);
    expect(left[0]).toEqual({ x: 244, y: 4, w: 50, h: 20 });
    expect(left[1]!.x).toBeLessThan(left[0]!.x);
  });
});
