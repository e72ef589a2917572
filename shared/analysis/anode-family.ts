import type { SweepPoint } from '../domain/sweep';
import type { AnodeSurface, Currents, VaSpan } from './anode-surface';
import { CurveSet, type AcrossProblem } from './curve-set';
import { groupCurves } from './group-curves';
import { estimateNoiseSigma } from './noise-sigma';
import { operatingPointAt, operatingPointAtCurrent, type OperatingPoint } from './operating-point';
import { formatNumber, formatSpanVolts, refuse, type Refusal } from './refusal';
import { SmoothedCurve, type CurveSpan } from './smoothed-curve';

/** Options for building an anode family. */
export interface AnodeFamilyOptions {
  /** Grid voltages closer than this form one curve, V (default: 2 % of the grid span, >= 0.02 V). */
  vg1ToleranceVolts?: number;
}

/** What the family holds about one measured curve. */
export interface AnodeCurveInfo {
  /** Grid voltage of the curve (mean of its readings), V. */
  vg1Volts: number;
  /** Lowest measured anode voltage, V. */
  vaMinVolts: number;
  /** Highest measured anode voltage, V. */
  vaMaxVolts: number;
  /** Measured Va spans, split where readings are missing, V. */
  spans: readonly CurveSpan[];
  /** Number of readings. */
  pointCount: number;
  /** Point noise of Ia used for the uncertainties, mA. */
  noiseSigmaMilliamps: number;
}

/**
 * A measured anode family, smoothed and ready to answer: Ia, gm, ra and mu anywhere inside the
 * measured region, and refusals (with the reason) outside it. Build it with buildAnodeFamily.
 */
export class AnodeFamily implements AnodeSurface {
  /** The measured curves, by ascending Vg1. */
  readonly curves: readonly AnodeCurveInfo[];

  constructor(
    /** The smoothed curves and the interpolation across them (parameter Vg1, abscissa Va). */
    readonly set: CurveSet,
    /** Mean screen voltage of the readings, V (0 for triodes). */
    readonly vg2Volts: number,
    /** Groups of fewer than four distinct Va that were left out. */
    readonly skippedVg1Volts: readonly number[],
  ) {
    this.curves = set.curves.map((c, j) => ({
      vg1Volts: set.params[j],
      vaMinVolts: c.min,
      vaMaxVolts: c.max,
      spans: c.spans,
      pointCount: c.pointCount,
      noiseSigmaMilliamps: c.noiseSigma,
    }));
  }

  /** Ia, gm, ra and mu at (Va, Vg1), with uncertainties; a refusal outside the region. */
  operatingPoint(vaVolts: number, vg1Volts: number): OperatingPoint | Refusal {
    return operatingPointAt(this, vaVolts, vg1Volts);
  }

  /** The same at the grid voltage where Ia is the given current at Va. */
  operatingPointAtCurrent(vaVolts: number, iaMilliamps: number): OperatingPoint | Refusal {
    return operatingPointAtCurrent(this, vaVolts, iaMilliamps);
  }

  /** Most negative and most positive measured grid voltage, V. */
  vg1Range(): { minVolts: number; maxVolts: number } {
    return { minVolts: this.set.params[0], maxVolts: this.set.params[this.set.params.length - 1] };
  }

  /** Va span where both curves around vg1 are measured (gaps inside are refused later), V. */
  vaRangeAt(vg1Volts: number): VaSpan | Refusal {
    const ps = this.set.params;
    const curves = this.set.curves;
    const { minVolts, maxVolts } = this.vg1Range();
    const tol = 1e-9 * (Math.abs(minVolts) + Math.abs(maxVolts) + 1);
    if (vg1Volts < minVolts - tol || vg1Volts > maxVolts + tol) {
      return refuse(
        this.describe(
          { kind: 'outside', side: vg1Volts < minVolts ? 'below' : 'above' },
          NaN,
          vg1Volts,
        ),
      );
    }
    const spans: [number, number][] = [];
    for (let i = 0; i + 1 < ps.length; i++) {
      if (vg1Volts < ps[i] - tol || vg1Volts > ps[i + 1] + tol) continue;
      spans.push([
        Math.max(curves[i].min, curves[i + 1].min),
        Math.min(curves[i].max, curves[i + 1].max),
      ]);
    }
    const [lo, hi] = spans.reduce((x, y) => (y[1] - y[0] > x[1] - x[0] ? y : x));
    if (!(hi > lo)) {
      return refuse(`the curves around Vg1 ${formatNumber(vg1Volts)} V share no measured Va range`);
    }
    return { ok: true, minVolts: lo, maxVolts: hi };
  }

  /** Smoothed Ia and Ig2 at (Va, Vg1), mA, without derivatives: the cheap query for plots. */
  currentsAt(vaVolts: number, vg1Volts: number): Currents | Refusal {
    const found = this.set.surfaceAt(vg1Volts, this.set.section(vaVolts));
    if (!found.ok) return refuse(this.describe(found.problem, vaVolts, vg1Volts));
    return { ok: true, iaMilliamps: found.point.y, ig2Milliamps: found.point.z };
  }

  /** A refusal reason for a problem forming weights at (Va, Vg1). */
  describe(problem: AcrossProblem, vaVolts: number, vg1Volts: number): string {
    const ps = this.set.params;
    const vg = (j: number) => `${formatNumber(ps[j])} V`;
    switch (problem.kind) {
      case 'outside':
        return problem.side === 'below'
          ? `Vg1 ${formatNumber(vg1Volts)} V is below the most negative measured curve (${vg(0)})`
          : `Vg1 ${formatNumber(vg1Volts)} V is above the most positive measured curve ` +
              `(${vg(ps.length - 1)})`;
      case 'missing': {
        const cov = this.set.curves[problem.curve].coverage(vaVolts);
        const va = `Va ${formatNumber(vaVolts)} V`;
        if (cov.kind === 'gap') {
          return `${va} falls in a gap in the measurements of the ${vg(problem.curve)} curve (${formatSpanVolts(cov.lo, cov.hi)})`;
        }
        if (cov.kind === 'inside') return `${va} is not usable on the ${vg(problem.curve)} curve`;
        return `${va} is ${cov.kind} the measured range of the ${vg(problem.curve)} curve (${formatSpanVolts(cov.lo, cov.hi)})`;
      }
      case 'few': {
        const list = Array.from({ length: problem.last - problem.first + 1 }, (_, n) =>
          vg(problem.first + n),
        ).join(', ');
        return (
          `only ${problem.last - problem.first + 1} curves (${list}) cover Va ` +
          `${formatNumber(vaVolts)} V around Vg1 ${formatNumber(vg1Volts)} V; derivatives across ` +
          `grid voltage need at least three`
        );
      }
    }
  }
}

/**
 * Builds an anode family from measured points in any order, possibly from several sweeps:
 * groups by Vg1, sorts by Va and smooths each curve. Refuses with fewer than three usable curves.
 */
export function buildAnodeFamily(
  points: readonly SweepPoint[],
  options: AnodeFamilyOptions = {},
): { ok: true; family: AnodeFamily } | Refusal {
  const groups = groupCurves(points, 'vg1', options.vg1ToleranceVolts);
  const own = groups.map((g) => estimateNoiseSigma(g.xs, g.ys));
  const usable = own
    .filter((o) => o.count >= 8)
    .map((o) => o.sigma)
    .sort((a, b) => a - b);
  const fallbackSigma = usable.length ? usable[usable.length >> 1] : undefined;
  const params: number[] = [];
  const curves: SmoothedCurve[] = [];
  const skipped: number[] = [];
  for (const g of groups) {
    const curve = SmoothedCurve.fit(g.xs, g.ys, g.zs, { fallbackSigma });
    if (curve) {
      params.push(g.keyVolts);
      curves.push(curve);
    } else skipped.push(g.keyVolts);
  }
  if (curves.length < 3) {
    return refuse(
      `an anode family needs at least three curves with four or more distinct Va each; ` +
        `found ${curves.length}`,
    );
  }
  let vg2 = 0;
  for (const p of points) vg2 += Number.isFinite(p.vg2Volts) ? p.vg2Volts : 0;
  return {
    ok: true,
    family: new AnodeFamily(
      new CurveSet(params, curves),
      points.length ? vg2 / points.length : 0,
      skipped,
    ),
  };
}
