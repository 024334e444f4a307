/**
 * Plain-loop baseline for the curves benchmark: the same formulas as
 * lib/aero's sampleCurves (ISA density ratio, parabolic polar, level flight,
 * EAS axis), written as straight loops over flat numbers with no validation,
 * no objects per case and no shared helpers. It exists only to be timed
 * against the library; tests/unit/aero/bench-baseline.test.ts checks that it
 * computes the same numbers.
 */

export interface BaselineCase {
  massKg: number;
  wingAreaM2: number;
  wingSpanM: number;
  zeroLiftDragCoefficient: number;
  oswaldEfficiency: number;
  maxLiftCoefficient: number;
  altitudeM: number;
  isaDeviationK: number;
  loadFactor: number;
}

/** Outputs per case, laid out like the library's (one Float64Array per quantity). */
export interface BaselineOutput {
  speedsMs: Float64Array;
  trueAirspeedMs: Float64Array[];
  zeroLiftDragN: Float64Array[];
  liftDependentDragN: Float64Array[];
  idealInducedDragN: Float64Array[];
  liftDependentIncrementN: Float64Array[];
  totalDragN: Float64Array[];
  powerRequiredW: Float64Array[];
  liftToDrag: Float64Array[];
  /** Per case: Vmd, Vmp, stall speed (EAS), (L/D)max. */
  markers: Float64Array[];
}

function arrays(caseCount: number, points: number): Float64Array[] {
  const out: Float64Array[] = [];
  for (let c = 0; c < caseCount; c++) out.push(new Float64Array(points));
  return out;
}

export function createBaselineOutput(caseCount: number, points: number): BaselineOutput {
  return {
    speedsMs: new Float64Array(points),
    trueAirspeedMs: arrays(caseCount, points),
    zeroLiftDragN: arrays(caseCount, points),
    liftDependentDragN: arrays(caseCount, points),
    idealInducedDragN: arrays(caseCount, points),
    liftDependentIncrementN: arrays(caseCount, points),
    totalDragN: arrays(caseCount, points),
    powerRequiredW: arrays(caseCount, points),
    liftToDrag: arrays(caseCount, points),
    markers: arrays(caseCount, 4),
  };
}

/** Curves of every case on an EAS axis from minSpeedMs to maxSpeedMs, written into `out`. */
export function baselineCurves(
  cases: readonly BaselineCase[],
  minSpeedMs: number,
  maxSpeedMs: number,
  points: number,
  out: BaselineOutput,
): void {
  const R = 287.05287;
  const g0 = 9.80665;
  const rho0 = 101325 / (R * 288.15);
  const exponent = g0 / (R * 0.0065);
  const p11 = 101325 * Math.pow(216.65 / 288.15, exponent);

  const speeds = out.speedsMs;
  const step = (maxSpeedMs - minSpeedMs) / (points - 1);
  for (let i = 0; i < points - 1; i++) speeds[i] = minSpeedMs + i * step;
  speeds[points - 1] = maxSpeedMs;

  for (let c = 0; c < cases.length; c++) {
    const k = cases[c] as BaselineCase;
    const h = k.altitudeM;
    let tStd: number;
    let p: number;
    if (h <= 11000) {
      tStd = 288.15 - 0.0065 * h;
      p = 101325 * Math.pow(tStd / 288.15, exponent);
    } else {
      tStd = 216.65;
      p = p11 * Math.exp((-(h - 11000) * g0) / (R * 216.65));
    }
    const rho = p / (R * (tStd + k.isaDeviationK));
    const sigma = rho / rho0;
    const toTas = 1 / Math.sqrt(sigma);
    const lift = k.loadFactor * k.massKg * g0;
    const ar = (k.wingSpanM * k.wingSpanM) / k.wingAreaM2;
    const kIdeal = 1 / (Math.PI * ar);
    const kInc = kIdeal * (1 / k.oswaldEfficiency - 1);
    const halfRhoS = 0.5 * rho * k.wingAreaM2;
    const a = halfRhoS * k.zeroLiftDragCoefficient;
    const bIdeal = (kIdeal * lift * lift) / halfRhoS;
    const bInc = (kInc * lift * lift) / halfRhoS;

    const tas = out.trueAirspeedMs[c] as Float64Array;
    const zl = out.zeroLiftDragN[c] as Float64Array;
    const ld = out.liftDependentDragN[c] as Float64Array;
    const ideal = out.idealInducedDragN[c] as Float64Array;
    const inc = out.liftDependentIncrementN[c] as Float64Array;
    const total = out.totalDragN[c] as Float64Array;
    const power = out.powerRequiredW[c] as Float64Array;
    const l2d = out.liftToDrag[c] as Float64Array;
    for (let i = 0; i < points; i++) {
      const v = (speeds[i] as number) * toTas;
      const v2 = v * v;
      const inv = 1 / v2;
      const dz = a * v2;
      const di = bIdeal * inv;
      const dinc = bInc * inv;
      const dl = di + dinc;
      const d = dz + dl;
      tas[i] = v;
      zl[i] = dz;
      ideal[i] = di;
      inc[i] = dinc;
      ld[i] = dl;
      total[i] = d;
      power[i] = d * v;
      l2d[i] = lift / d;
    }

    const kTotal = kIdeal + kInc;
    const m = out.markers[c] as Float64Array;
    const vmd = Math.sqrt((2 * lift) / (rho0 * k.wingAreaM2 * Math.sqrt(k.zeroLiftDragCoefficient / kTotal)));
    m[0] = vmd;
    m[1] = vmd / Math.pow(3, 0.25);
    m[2] = Math.sqrt((2 * lift) / (rho0 * k.wingAreaM2 * k.maxLiftCoefficient));
    m[3] = 1 / (2 * Math.sqrt(k.zeroLiftDragCoefficient * kTotal));
  }
}
