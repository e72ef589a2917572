import { hermiteBasis } from './cubic-hermite';
import { findRoot } from './find-root';
import { fitLocalPolynomial, type LocalFit } from './local-polynomial';
import { estimateNoiseSigma } from './noise-sigma';

/** One curve evaluated at one abscissa. Units: those of the curve (e.g. V and mA). */
export interface CurveSample {
  /** Smoothed value. */
  y: number;
  /** Smoothed slope dy/dx. */
  slope: number;
  /** Standard uncertainty of y. */
  yUncertainty: number;
  /** Standard uncertainty of the slope. */
  slopeUncertainty: number;
  /** Smoothed second channel (screen current). */
  z: number;
}

/** An abscissa span without a gap in the measurements. */
export interface CurveSpan {
  /** Lowest measured abscissa of the span. */
  lo: number;
  /** Highest measured abscissa of the span. */
  hi: number;
}

/** Where an abscissa lies with respect to a curve's measurements. */
export type CurveCoverage =
  | { kind: 'inside' }
  | { kind: 'below' | 'above'; lo: number; hi: number }
  | { kind: 'gap'; lo: number; hi: number };

/** Tuning of the smoother. */
export interface SmoothingOptions {
  /** Point noise to assume when the curve is too short to estimate its own, unit of y. */
  fallbackSigma?: number;
}

const MIN_WINDOW = 7;
// Widest window the search tries, in readings: wider ones cost time and, on real curves, only
// add bias.
const MAX_WINDOW = 61;
// Knots per curve at which the window search runs (the rest take their neighbours' choice).
const KNOTS_SEARCHED = 64;
const LADDER_GROWTH = 1.3;
// Interval half-widths of the rule, in noise sigmas: tighter for values, whose bias across
// neighbouring curves goes straight into gm, than for slopes, whose noise dominates ra.
const ICI_VALUE_WIDTH = 1;
const ICI_SLOPE_WIDTH = 2;
const WINDOW_MEDIAN_RADIUS = 2;
const MIN_OWN_RESIDUALS = 8;

/**
 * One measured curve y(x), smoothed: a LOESS cubic (tricube weights) fitted around every
 * measured abscissa, its window chosen from the data (see chooseWindows: narrow on clean data,
 * wide on noisy data, never across a bend the noise does not hide), joined by cubic Hermite
 * pieces through the fitted values and slopes. Written here because no maintained npm package
 * offers local polynomial fits with derivative noise gains; a monotone spline (PCHIP) alone
 * would pass the noise straight into the slopes. The local fit gives derivatives with a known
 * noise gain and low bias; the Hermite join makes evaluation between readings cheap.
 */
export class SmoothedCurve {
  /** Measured spans, split at gaps, ascending. */
  readonly spans: readonly CurveSpan[];
  /** Point noise used for the uncertainties, unit of y. */
  readonly noiseSigma: number;
  /** Number of measured points. */
  readonly pointCount: number;

  private constructor(
    private readonly knots: Float64Array,
    private readonly values: Float64Array,
    private readonly slopes: Float64Array,
    private readonly valueUnc: Float64Array,
    private readonly slopeUnc: Float64Array,
    private readonly zValues: Float64Array,
    private readonly zSlopes: Float64Array,
    private readonly spanEnds: Int32Array,
    spans: CurveSpan[],
    noiseSigma: number,
    pointCount: number,
  ) {
    this.spans = spans;
    this.noiseSigma = noiseSigma;
    this.pointCount = pointCount;
  }

  /** Smooths sorted points (xs ascending); null when fewer than four distinct abscissas. */
  static fit(
    xs: ArrayLike<number>,
    ys: ArrayLike<number>,
    zs: ArrayLike<number>,
    options: SmoothingOptions = {},
  ): SmoothedCurve | null {
    const n = xs.length;
    const unique: number[] = [];
    const firstIndex: number[] = [];
    for (let i = 0; i < n; i++) {
      if (i === 0 || xs[i] !== xs[i - 1]) {
        unique.push(xs[i]);
        firstIndex.push(i);
      }
    }
    if (unique.length < 4) return null;
    const own = estimateNoiseSigma(xs, ys);
    let yScale = 0;
    for (let i = 0; i < n; i++) yScale = Math.max(yScale, Math.abs(ys[i]));
    const floor = 1e-12 * yScale + 1e-300;
    const sigma = Math.max(
      own.count >= MIN_OWN_RESIDUALS || options.fallbackSigma === undefined
        ? own.sigma
        : options.fallbackSigma,
      floor,
    );
    const m = unique.length;
    const knots = Float64Array.from(unique);
    const values = new Float64Array(m);
    const slopes = new Float64Array(m);
    const valueUnc = new Float64Array(m);
    const slopeUnc = new Float64Array(m);
    const zValues = new Float64Array(m);
    const zSlopes = new Float64Array(m);
    const kMin = Math.min(n, MIN_WINDOW);
    // Windows are chosen at every stride-th knot (they change slowly along a curve, and the
    // search is most of the work), smoothed, and taken over by the knots in between.
    const stride = Math.max(1, Math.floor(m / KNOTS_SEARCHED));
    const searched: number[] = [];
    for (let u = 0; u < m; u += stride) searched.push(u);
    if (searched[searched.length - 1] !== m - 1) searched.push(m - 1);
    const chosen = searched.map((u) => chooseWindows(xs, ys, zs, firstIndex[u], kMin, sigma));
    const valueWindows = smoothWindows(chosen.map((c) => c.value));
    const slopeWindows = smoothWindows(chosen.map((c) => c.slope));
    const nearest = (u: number) => Math.min(Math.round(u / stride), searched.length - 1);
    const kValue = Array.from({ length: m }, (_, u) => valueWindows[nearest(u)]);
    const kSlope = Array.from({ length: m }, (_, u) => slopeWindows[nearest(u)]);
    for (let u = 0; u < m; u++) {
      const v = fitWindow(xs, ys, zs, firstIndex[u], kValue[u]);
      const d = kSlope[u] === kValue[u] ? v : fitWindow(xs, ys, zs, firstIndex[u], kSlope[u]);
      if (!v || !d) return null;
      // Truncation indicator: on the narrowest window, the gap to the fit one degree lower; on a
      // wider one, the change from the next narrower window of the ladder, which is what the
      // widening bought in bias (the order gap of a wide window overstates a cubic's error).
      const start = firstIndex[u];
      const vPrev =
        kValue[u] > kMin ? fitWindow(xs, ys, zs, start, narrower(kValue[u], kMin), false) : null;
      const dPrev =
        kSlope[u] > kMin ? fitWindow(xs, ys, zs, start, narrower(kSlope[u], kMin), false) : null;
      const vTrunc = vPrev ? Math.abs(v.value - vPrev.value) : v.valueOrderGap;
      const dTrunc = dPrev ? Math.abs(d.slope - dPrev.slope) : d.slopeOrderGap;
      values[u] = v.value;
      slopes[u] = d.slope;
      valueUnc[u] = Math.hypot(Math.max(sigma, v.residualSigma) * v.valueGain, vTrunc);
      slopeUnc[u] = Math.hypot(Math.max(sigma, d.residualSigma) * d.slopeGain, dTrunc);
      zValues[u] = v.z;
      zSlopes[u] = d.zSlope;
    }
    const { spans, spanEnds } = splitAtGaps(knots);
    return new SmoothedCurve(
      knots,
      values,
      slopes,
      valueUnc,
      slopeUnc,
      zValues,
      zSlopes,
      spanEnds,
      spans,
      sigma,
      n,
    );
  }

  /** Lowest measured abscissa. */
  get min(): number {
    return this.knots[0];
  }

  /** Highest measured abscissa. */
  get max(): number {
    return this.knots[this.knots.length - 1];
  }

  /** Where x lies against the measurements. */
  coverage(x: number): CurveCoverage {
    const tol = 1e-9 * (Math.abs(this.max) + Math.abs(this.min) + 1);
    if (x < this.min - tol) return { kind: 'below', lo: this.min, hi: this.max };
    if (x > this.max + tol) return { kind: 'above', lo: this.min, hi: this.max };
    for (let s = 0; s + 1 < this.spans.length; s++) {
      const lo = this.spans[s].hi;
      const hi = this.spans[s + 1].lo;
      if (x > lo + tol && x < hi - tol) return { kind: 'gap', lo, hi };
    }
    return { kind: 'inside' };
  }

  /** The smoothed curve at x, or null outside the measured spans. */
  sampleAt(x: number): CurveSample | null {
    if (this.coverage(x).kind !== 'inside') return null;
    const k = this.knots;
    const last = k.length - 1;
    const xc = Math.min(Math.max(x, k[0]), k[last]);
    let lo = 0;
    let hi = last;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (k[mid] <= xc) lo = mid;
      else hi = mid;
    }
    if (xc === k[lo] || this.isSpanEnd(lo)) return this.knotSample(lo);
    if (xc === k[hi]) return this.knotSample(hi);
    const dx = k[hi] - k[lo];
    const t = (xc - k[lo]) / dx;
    const [h00, h10, h01, h11] = hermiteBasis(t);
    const v = this.values;
    const d = this.slopes;
    const z = this.zValues;
    const zd = this.zSlopes;
    return {
      y: h00 * v[lo] + h10 * dx * d[lo] + h01 * v[hi] + h11 * dx * d[hi],
      // The slope is interpolated from the knots' own fitted slopes rather than taken from the
      // Hermite piece: the piece's derivative leans on the difference of two neighbouring
      // values, which over a few volts is far noisier than either local slope.
      slope: (1 - t) * d[lo] + t * d[hi],
      yUncertainty: (1 - t) * this.valueUnc[lo] + t * this.valueUnc[hi],
      slopeUncertainty: (1 - t) * this.slopeUnc[lo] + t * this.slopeUnc[hi],
      z: h00 * z[lo] + h10 * dx * zd[lo] + h01 * z[hi] + h11 * dx * zd[hi],
    };
  }

  /**
   * The curve carried on past its last measured abscissa to x, at most `maxExtendBy` beyond it,
   * or null: a straight line through the end with the slope of the chord over the last d, with
   * the uncertainty of the end value, of the slope over the distance, and of the curvature of
   * the last knot interval left out (u_y² + (u_slope·d)² + (½·y''·d²)²). The curvature is not
   * added to the value: estimated from two noisy end slopes it made the result worse on
   * simulated noisy sweeps. For curves a sweep ended at its dissipation or current limit a
   * little short of a point the rest of the family reaches.
   */
  extendedSampleAt(x: number, maxExtendBy: number): CurveSample | null {
    const last = this.knots.length - 1;
    const d = x - this.knots[last];
    if (!(d > 0) || d > maxExtendBy || last < 1) return null;
    const end = this.knotSample(last);
    const h = this.knots[last] - this.knots[last - 1];
    const curvature = (this.slopes[last] - this.slopes[last - 1]) / h;
    const bend = 0.5 * curvature * d * d;
    // The chord over the last d before the end: steadier than the end knot's own slope, whose
    // window is one-sided there.
    const from = Math.max(this.knots[0], this.knots[last] - d);
    const back = this.sampleAt(from);
    const slope =
      back && from < this.knots[last] ? (end.y - back.y) / (this.knots[last] - from) : end.slope;
    return {
      y: end.y + slope * d,
      slope: end.slope + curvature * d,
      yUncertainty: Math.hypot(end.yUncertainty, end.slopeUncertainty * d, bend),
      slopeUncertainty: Math.hypot(end.slopeUncertainty, curvature * d),
      z: end.z + this.zSlopes[last] * d,
    };
  }

  /**
   * The abscissa where the smoothed curve equals y, within the measured spans; where it does so
   * more than once, the crossing nearest `near`. Null where it never does.
   */
  abscissaAt(y: number, near: number): number | null {
    const k = this.knots;
    const v = this.values;
    let best: number | null = null;
    for (let i = 0; i + 1 < k.length; i++) {
      if (this.isSpanEnd(i)) continue;
      if ((v[i] - y) * (v[i + 1] - y) > 0) continue;
      const x = findRoot(
        (xi) => (this.sampleAt(xi)?.y ?? NaN) - y,
        k[i],
        k[i + 1],
        1e-9 * (k[i + 1] - k[i]),
      );
      if (x === null) continue;
      if (best === null || Math.abs(x - near) < Math.abs(best - near)) best = x;
    }
    return best;
  }

  private isSpanEnd(i: number): boolean {
    for (const e of this.spanEnds) if (e === i && i < this.knots.length - 1) return true;
    return false;
  }

  private knotSample(i: number): CurveSample {
    return {
      y: this.values[i],
      slope: this.slopes[i],
      yUncertainty: this.valueUnc[i],
      slopeUncertainty: this.slopeUnc[i],
      z: this.zValues[i],
    };
  }
}

/** Index span of the k readings nearest xs[start], widened to keep equal abscissas together. */
function windowAround(xs: ArrayLike<number>, start: number, k: number): [number, number] {
  const n = xs.length;
  const x0 = xs[start];
  let lo = start;
  let hi = start;
  while (hi + 1 < n && xs[hi + 1] === x0) hi++;
  const target = Math.min(k, n);
  while (hi - lo + 1 < target) {
    const left = lo > 0 ? x0 - xs[lo - 1] : Infinity;
    const right = hi + 1 < n ? xs[hi + 1] - x0 : Infinity;
    if (left <= right) lo--;
    else hi++;
  }
  // Keep every reading at the window's edge abscissa, so that the window is a set of points
  // closer than a distance and does not depend on the order of equal readings.
  while (lo > 0 && xs[lo - 1] === xs[lo]) lo--;
  while (hi + 1 < n && xs[hi + 1] === xs[hi]) hi++;
  return [lo, hi];
}

/** The local fit over the k readings nearest xs[start]. */
function fitWindow(
  xs: ArrayLike<number>,
  ys: ArrayLike<number>,
  zs: ArrayLike<number>,
  start: number,
  k: number,
  full = true,
): LocalFit | null {
  const [lo, hi] = windowAround(xs, start, k);
  return fitLocalPolynomial(xs, ys, zs, lo, hi, xs[start], full);
}

/**
 * Chooses window sizes around xs[start] over a ladder of growing k-nearest windows: separately
 * for the value and for the slope, the widest window whose estimate is consistent with every
 * narrower one. This is the intersection-of-confidence-intervals rule (Goldenshluger and
 * Nemirovski, Math. Meth. Stat. 6, 1997; Katkovnik, Signal Processing 1999), a local
 * bias-variance balance that needs only the noise sigma: noise-free curves keep the narrowest
 * window, noisy ones widen until curvature shows.
 */
function chooseWindows(
  xs: ArrayLike<number>,
  ys: ArrayLike<number>,
  zs: ArrayLike<number>,
  start: number,
  kMin: number,
  sigma: number,
): { value: number; slope: number } {
  const n = xs.length;
  let value = kMin;
  let slope = kMin;
  let vLo = -Infinity;
  let vHi = Infinity;
  let sLo = -Infinity;
  let sHi = Infinity;
  let valueHolds = true;
  let slopeHolds = true;
  for (let k = kMin; valueHolds || slopeHolds; k = wider(k)) {
    const [lo, hi] = windowAround(xs, start, k);
    const fit = fitLocalPolynomial(xs, ys, zs, lo, hi, xs[start], false);
    if (fit) {
      const dv = ICI_VALUE_WIDTH * sigma * fit.valueGain;
      const ds = ICI_SLOPE_WIDTH * sigma * fit.slopeGain;
      vLo = Math.max(vLo, fit.value - dv);
      vHi = Math.min(vHi, fit.value + dv);
      sLo = Math.max(sLo, fit.slope - ds);
      sHi = Math.min(sHi, fit.slope + ds);
      valueHolds &&= vLo <= vHi;
      slopeHolds &&= sLo <= sHi;
      if (valueHolds) value = hi - lo + 1;
      if (slopeHolds) slope = hi - lo + 1;
    }
    if (hi - lo + 1 >= Math.min(n, MAX_WINDOW)) break;
  }
  return { value, slope };
}

/** The next window size of the ladder. */
function wider(k: number): number {
  return Math.max(k + 2, Math.round(k * LADDER_GROWTH));
}

/** The largest window size of the ladder below k (kMin at least). */
function narrower(k: number, kMin: number): number {
  let prev = kMin;
  for (let j = kMin; j < k; j = wider(j)) prev = j;
  return prev;
}

/**
 * Running median of the chosen window sizes over neighbouring knots: the rule decides each knot
 * on noisy evidence, and windows that jump from knot to knot make slopes jump too.
 */
function smoothWindows(ks: number[]): number[] {
  const r = WINDOW_MEDIAN_RADIUS;
  return ks.map((_, i) => {
    const near = ks.slice(Math.max(0, i - r), i + r + 1).sort((a, b) => a - b);
    return near[near.length >> 1];
  });
}

/** Splits knots into spans where a spacing is far above the typical one. */
function splitAtGaps(knots: Float64Array): { spans: CurveSpan[]; spanEnds: Int32Array } {
  const gaps = [];
  for (let i = 1; i < knots.length; i++) gaps.push(knots[i] - knots[i - 1]);
  const sorted = [...gaps].sort((a, b) => a - b);
  const median = sorted[sorted.length >> 1];
  const span = knots[knots.length - 1] - knots[0];
  const spans: CurveSpan[] = [];
  const ends: number[] = [];
  let lo = knots[0];
  for (let i = 1; i < knots.length; i++) {
    const gap = knots[i] - knots[i - 1];
    if (gap > 5 * median && gap > 0.05 * span) {
      spans.push({ lo, hi: knots[i - 1] });
      ends.push(i - 1);
      lo = knots[i];
    }
  }
  spans.push({ lo, hi: knots[knots.length - 1] });
  ends.push(knots.length - 1);
  return { spans, spanEnds: Int32Array.from(ends) };
}
