import { sampleCurves, type CurveCase, type CurveRange, type CurveSet } from "../index";
import { baselineCurves, createBaselineOutput, type BaselineCase, type BaselineOutput } from "./baseline";

/**
 * Curves benchmark: the library's sampleCurves against the plain-loop
 * baseline in ./baseline.ts, same formulas, same randomised inputs, measured
 * in the same run (interleaved repetitions after a warm-up; the median is
 * reported). Runs anywhere `performance.now()` exists (Node or a browser).
 */

export interface CurvesBenchOptions {
  cases?: number;
  points?: number;
  /** Timed repetitions per contender; the median is reported. */
  repetitions?: number;
  /** Calls per repetition (each call computes every case at every point). */
  callsPerRepetition?: number;
  /** Untimed calls per contender before timing. */
  warmupCalls?: number;
  /** Number of distinct random input sets cycled through. */
  inputSets?: number;
  /** PRNG seed; random by default (printed so a run can be repeated). */
  seed?: number;
  /** Pass when library / baseline <= this. */
  targetRatio?: number;
}

export interface CurvesBenchResult {
  label: string;
  cases: number;
  points: number;
  repetitions: number;
  callsPerRepetition: number;
  seed: number;
  /** Median ns per point (one point = one speed of one case, all quantities). */
  libraryNsPerPoint: number;
  /** Same, when the library allocates a fresh result on every call (no `reuse`). */
  libraryFreshNsPerPoint: number;
  baselineNsPerPoint: number;
  /** Median over repetitions of (library time / baseline time) measured back to back: robust to load changes. */
  ratio: number;
  /** libraryNsPerPoint / baselineNsPerPoint (ratio of the medians), for comparison. */
  ratioOfMedians: number;
  targetRatio: number;
  /** Largest relative difference between library and baseline outputs (they must compute the same numbers). */
  maxRelativeDifference: number;
  /** Sum of sampled outputs, printed so no result is dead code. */
  sink: number;
  pass: boolean;
}

/** Small deterministic PRNG (mulberry32). */
function prng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

interface InputSet {
  library: CurveCase[];
  baseline: BaselineCase[];
  range: CurveRange;
}

function randomInputs(random: () => number, caseCount: number, points: number): InputSet {
  const between = (lo: number, hi: number) => lo + (hi - lo) * random();
  const library: CurveCase[] = [];
  const baseline: BaselineCase[] = [];
  for (let c = 0; c < caseCount; c++) {
    const wingAreaM2 = between(10, 30);
    const b: BaselineCase = {
      massKg: between(500, 2500),
      wingAreaM2,
      wingSpanM: Math.sqrt(between(5, 12) * wingAreaM2),
      zeroLiftDragCoefficient: between(0.02, 0.05),
      oswaldEfficiency: between(0.6, 0.95),
      maxLiftCoefficient: between(1.2, 2.2),
      altitudeM: between(0, 14000),
      isaDeviationK: between(-20, 20),
      loadFactor: between(1, 2),
    };
    baseline.push(b);
    library.push({
      aircraft: {
        massKg: b.massKg,
        wingAreaM2: b.wingAreaM2,
        wingSpanM: b.wingSpanM,
        zeroLiftDragCoefficient: b.zeroLiftDragCoefficient,
        oswaldEfficiency: b.oswaldEfficiency,
        maxLiftCoefficient: b.maxLiftCoefficient,
      },
      altitudeM: b.altitudeM,
      isaDeviationK: b.isaDeviationK,
      loadFactor: b.loadFactor,
    });
  }
  return { library, baseline, range: { minSpeedMs: between(10, 25), maxSpeedMs: between(70, 110), points, speedAxis: "equivalent" } };
}

function median(values: number[]): number {
  const sorted = [...values].sort((x, y) => x - y);
  const mid = sorted.length >> 1;
  return sorted.length % 2 === 1 ? (sorted[mid] as number) : ((sorted[mid - 1] as number) + (sorted[mid] as number)) / 2;
}

function relDiff(a: number, b: number): number {
  return Math.abs(a - b) / Math.max(Math.abs(a), Math.abs(b), Number.MIN_VALUE);
}

/** Largest relative difference between a library result and the baseline's outputs. */
export function compareWithBaseline(lib: CurveSet<Float64Array>, base: BaselineOutput): number {
  let worst = 0;
  const n = lib.points;
  for (let i = 0; i < n; i++) worst = Math.max(worst, relDiff(lib.speedsMs[i] as number, base.speedsMs[i] as number));
  lib.cases.forEach((c, ci) => {
    const pairs: [Float64Array, Float64Array][] = [
      [c.trueAirspeedMs, base.trueAirspeedMs[ci] as Float64Array],
      [c.zeroLiftDragN, base.zeroLiftDragN[ci] as Float64Array],
      [c.liftDependentDragN, base.liftDependentDragN[ci] as Float64Array],
      [c.idealInducedDragN, base.idealInducedDragN[ci] as Float64Array],
      [c.liftDependentIncrementN, base.liftDependentIncrementN[ci] as Float64Array],
      [c.totalDragN, base.totalDragN[ci] as Float64Array],
      [c.powerRequiredW, base.powerRequiredW[ci] as Float64Array],
      [c.liftToDrag, base.liftToDrag[ci] as Float64Array],
    ];
    for (const [x, y] of pairs) for (let i = 0; i < n; i++) worst = Math.max(worst, relDiff(x[i] as number, y[i] as number));
    const m = base.markers[ci] as Float64Array;
    worst = Math.max(
      worst,
      relDiff(c.markers.minimumDragSpeedMs, m[0] as number),
      relDiff(c.markers.minimumPowerSpeedMs, m[1] as number),
      relDiff(c.markers.stallSpeedMs, m[2] as number),
      relDiff(c.markers.maxLiftToDrag, m[3] as number),
    );
  });
  return worst;
}

/** Runs the benchmark and returns the figures (printing is left to the caller). */
export function runCurvesBench(options: CurvesBenchOptions = {}): CurvesBenchResult {
  const caseCount = options.cases ?? 4;
  const points = options.points ?? 400;
  const repetitions = options.repetitions ?? 61;
  const calls = options.callsPerRepetition ?? 40;
  const warmup = options.warmupCalls ?? 2000;
  const setCount = options.inputSets ?? 64;
  const seed = options.seed ?? Math.floor(Math.random() * 2 ** 31);
  const targetRatio = options.targetRatio ?? 2;

  const random = prng(seed);
  const sets: InputSet[] = [];
  for (let s = 0; s < setCount; s++) sets.push(randomInputs(random, caseCount, points));

  let libOut = sampleCurves(sets[0]!.library, sets[0]!.range);
  const baseOut = createBaselineOutput(caseCount, points);
  let sink = 0;
  let cursor = 0;
  // The index read back from each result changes every call, so the work cannot be skipped or hoisted.
  const probe = () => (cursor * 7919) % points;

  const runLibrary = (n: number) => {
    for (let k = 0; k < n; k++) {
      const set = sets[cursor % setCount]!;
      libOut = sampleCurves(set.library, set.range, { reuse: libOut });
      const i = probe();
      for (const c of libOut.cases)
        sink += (c.totalDragN[i] as number) + (c.powerRequiredW[i] as number) * 1e-3 + (c.liftToDrag[i] as number);
      cursor++;
    }
  };
  const runLibraryFresh = (n: number) => {
    for (let k = 0; k < n; k++) {
      const set = sets[cursor % setCount]!;
      const out = sampleCurves(set.library, set.range);
      const i = probe();
      for (const c of out.cases) sink += (c.totalDragN[i] as number) + (c.powerRequiredW[i] as number) * 1e-3 + (c.liftToDrag[i] as number);
      cursor++;
    }
  };
  const runBaseline = (n: number) => {
    for (let k = 0; k < n; k++) {
      const set = sets[cursor % setCount]!;
      const r = set.range;
      baselineCurves(set.baseline, r.minSpeedMs, r.maxSpeedMs, points, baseOut);
      const i = probe();
      for (let c = 0; c < caseCount; c++) {
        sink +=
          ((baseOut.totalDragN[c] as Float64Array)[i] as number) +
          ((baseOut.powerRequiredW[c] as Float64Array)[i] as number) * 1e-3 +
          ((baseOut.liftToDrag[c] as Float64Array)[i] as number);
      }
      cursor++;
    }
  };

  runLibrary(warmup);
  runLibraryFresh(warmup / 4);
  runBaseline(warmup);

  const time = (fn: (n: number) => void) => {
    const t0 = performance.now();
    fn(calls);
    return ((performance.now() - t0) * 1e6) / (calls * caseCount * points);
  };
  const lib: number[] = [];
  const fresh: number[] = [];
  const base: number[] = [];
  const paired: number[] = [];
  for (let r = 0; r < repetitions; r++) {
    // Short repetitions back to back, alternating which goes first, so both see the same machine load.
    let l: number;
    let b: number;
    if (r % 2 === 0) {
      l = time(runLibrary);
      b = time(runBaseline);
    } else {
      b = time(runBaseline);
      l = time(runLibrary);
    }
    lib.push(l);
    base.push(b);
    paired.push(l / b);
    fresh.push(time(runLibraryFresh));
  }

  const check = sets[0]!;
  baselineCurves(check.baseline, check.range.minSpeedMs, check.range.maxSpeedMs, points, baseOut);
  const maxRelativeDifference = compareWithBaseline(sampleCurves(check.library, check.range), baseOut);

  const libraryNsPerPoint = median(lib);
  const baselineNsPerPoint = median(base);
  const ratio = median(paired);
  return {
    label: "sampleCurves vs plain-loop baseline",
    cases: caseCount,
    points,
    repetitions,
    callsPerRepetition: calls,
    seed,
    libraryNsPerPoint,
    libraryFreshNsPerPoint: median(fresh),
    baselineNsPerPoint,
    ratio,
    ratioOfMedians: libraryNsPerPoint / baselineNsPerPoint,
    targetRatio,
    maxRelativeDifference,
    sink,
    pass: ratio <= targetRatio && maxRelativeDifference <= 1e-9 && Number.isFinite(sink),
  };
}

/** Clear labelled lines for the terminal (one fact per line). */
export function formatCurvesBench(r: CurvesBenchResult): string[] {
  const ns = (x: number) => `${x.toFixed(2)} ns/point`;
  return [
    `[aero curves] ${r.label}: ${r.cases} cases x ${r.points} speeds, ${r.repetitions} repetitions x ${r.callsPerRepetition} calls, median, seed ${r.seed}`,
    `[aero curves] library (reused result):   ${ns(r.libraryNsPerPoint)}`,
    `[aero curves] library (fresh result):    ${ns(r.libraryFreshNsPerPoint)} (informative; allocates every call)`,
    `[aero curves] baseline (plain loops):    ${ns(r.baselineNsPerPoint)}`,
    `[aero curves] ratio library/baseline:    ${r.ratio.toFixed(2)} (median of paired repetitions; target <= ${r.targetRatio.toFixed(2)})`,
    `[aero curves] ratio of the medians:      ${r.ratioOfMedians.toFixed(2)} (informative)`,
    `[aero curves] library vs baseline max relative difference: ${r.maxRelativeDifference.toExponential(2)} (must be <= 1e-9)`,
    `[aero curves] sink: ${r.sink.toExponential(6)}`,
    `[aero curves] ${r.pass ? "PASS" : "FAIL"}`,
  ];
}
