import { hermiteBasis } from './cubic-hermite';
import { lagrangeSlopeWeights } from './lagrange-slope-weights';
import { polynomialAtZero } from './polynomial-at-zero';
import type { CurveSample, SmoothedCurve } from './smoothed-curve';

/** Why the surface could not be formed at a point. */
export type AcrossProblem =
  | { kind: 'outside'; side: 'below' | 'above' }
  | { kind: 'missing'; curve: number }
  | { kind: 'few'; first: number; last: number };

/** The surface at one (abscissa, parameter) point, in the curves' units (V, mA). */
export interface SurfacePoint {
  /** Value (Ia, mA). */
  y: number;
  /** Standard uncertainty of y. */
  yUncertainty: number;
  /** Derivative of y in the parameter (across curves; gm in mA/V for an anode family). */
  dp: number;
  /** Standard uncertainty of dp. */
  dpUncertainty: number;
  /** Derivative of y in the abscissa (along curves; 1/ra in mA/V for an anode family). */
  dx: number;
  /** Standard uncertainty of dx. */
  dxUncertainty: number;
  /** Second channel (Ig2, mA). */
  z: number;
  /** Index of the curve at the lower end of the interval. */
  lower: number;
  /** Indices of the curves that carried the result. */
  curves: number[];
}

/** Per-curve quantities at one abscissa, linearised (see surfaceAt); NaN where unknown. */
interface Section {
  /** Ia^(2/3). */
  value: Float64Array;
  valueUnc: Float64Array;
  /** d(Ia^(2/3))/dx. */
  along: Float64Array;
  alongUnc: Float64Array;
  /** Ig2^(2/3). */
  z: Float64Array;
  /** 1 where the curve conducts clearly (see LIVE_MARGIN). */
  live: Uint8Array;
}

/** Sets of neighbouring curves: [curves at most, shift]; the first gives the result. */
const STENCILS: readonly [number, number][] = [
  [5, 0],
  [3, 0],
  [5, -1],
  [5, 1],
];

/**
 * A curve takes part in the derivatives of its neighbours only where its current is this many
 * uncertainties clear of zero: near cut-off the smoothing along the curve blurs the kink of the
 * law, and the linearised value there would mislead the derivatives next to it.
 */
const LIVE_MARGIN = 10;

/**
 * Curves the along-curve slope is fitted over: fewer than for the value, because that slope's
 * shape across curves differs between triodes and pentodes, and a low-degree fit over a wide
 * set would bend it at the edges of the family.
 */
const ALONG_CURVES = 3;

/**
 * A family of curves at ascending parameter values (Vg1 of anode curves, or Va of transfer
 * curves), each smoothed along its own abscissa. Across curves, at one abscissa, it works on
 * Ia^(2/3): under the 3/2-power law (Child-Langmuir) that is linear in grid and anode voltage,
 * and it stays close to linear for real valves, so a few curves give accurate derivatives.
 * - The value comes from cubic Hermite pieces through the curves' values, with knot slopes
 *   limited as Hyman (SIAM J. Sci. Stat. Comput. 4, 1983) so that monotone data stay monotone
 *   (no overshoot at cut-off).
 * - The derivative across curves, and the along-curve slope, come from a polynomial over up to
 *   five curves nearest the point: interpolating where the values are exact, least squares of
 *   the lowest degree their uncertainties allow where they are noisy.
 * Uncertainties combine the propagated per-curve uncertainties with the largest disagreement
 * of estimates from other sets of curves (fewer, or shifted to either side).
 */
export class CurveSet {
  private readonly x = new Float64Array(6);
  private readonly y = new Float64Array(6);
  private readonly u = new Float64Array(6);

  constructor(
    /** Parameter of each curve, ascending, V. */
    readonly params: readonly number[],
    /** The smoothed curves, in the order of params. */
    readonly curves: readonly SmoothedCurve[],
  ) {}

  /** Every curve sampled at abscissa x (null where x is outside a curve's measurements). */
  section(x: number): (CurveSample | null)[] {
    return this.curves.map((c) => c.sampleAt(x));
  }

  /**
   * section(x), with the curves of parameter up to `upToParam` that end short of x by at most
   * `byAtMost` carried on to x (SmoothedCurve.extendedSampleAt), where a curve of lower
   * parameter reaches x. In an anode family these are curves the sweep cut at its dissipation
   * or current limit while the more negative ones went on; x beyond the whole family is never
   * reached this way.
   */
  sectionExtendingCut(x: number, byAtMost: number, upToParam: number): (CurveSample | null)[] {
    const samples = this.section(x);
    let below = false;
    for (let j = 0; j < samples.length && this.params[j] <= upToParam; j++) {
      if (samples[j]) below = true;
      else if (below) samples[j] = this.curves[j].extendedSampleAt(x, byAtMost);
    }
    return samples;
  }

  /** The surface at parameter p from the curves sampled at one abscissa (see section). */
  surfaceAt(
    p: number,
    samples: readonly (CurveSample | null)[],
  ): { ok: true; point: SurfacePoint } | { ok: false; problem: AcrossProblem } {
    const sec = linearise(samples);
    const located = this.locate(p, sec.value);
    if (!located.ok) return located;
    const { i, a, b } = located;
    const ps = this.params;
    const m = ps.length;
    // Curves the polynomials lean on: the two around p and every live one; for the slope along
    // the curves, which a cut-off curve does not have in this form, live ones only.
    const eligible: number[] = [];
    const liveOnly: number[] = [];
    for (let j = a; j <= b; j++) {
      if (sec.live[j] || j === i || j === i + 1) eligible.push(j);
      if (sec.live[j]) liveOnly.push(j);
    }
    const alongSet = liveOnly.length >= 2 ? liveOnly : eligible;
    const dx = ps[i + 1] - ps[i];
    const t = Math.min(Math.max((p - ps[i]) / dx, 0), 1);
    const [h00, h10, h01, h11] = hermiteBasis(t);
    const c0 = new Float64Array(m);
    const c1 = new Float64Array(m);
    const w = new Float64Array(m);
    const results = STENCILS.map(([size, shift]) => {
      this.knotSlope(i, a, b, size, shift, sec, c0);
      this.knotSlope(i + 1, a, b, size, shift, sec, c1);
      let value = h00 * sec.value[i] + h01 * sec.value[i + 1];
      for (let j = a; j <= b; j++) value += dx * (h10 * c0[j] + h11 * c1[j]) * sec.value[j];
      const [lo, hi] = this.nearest(p, eligible, size, shift);
      const fit = this.fitAt(p, eligible, lo, hi, sec.value, sec.valueUnc);
      const [alo, ahi] = this.nearest(p, alongSet, Math.min(size, ALONG_CURVES), shift);
      const along = this.fitAt(p, alongSet, alo, ahi, sec.along, sec.alongUnc);
      return { value, fit, along, c0: c0.slice(), c1: c1.slice(), lo, hi };
    });
    const main = results[0];
    if (!main.fit || !main.along) return { ok: false, problem: { kind: 'few', first: a, last: b } };
    // Noise of the Hermite value: its weights on each curve.
    for (let j = a; j <= b; j++) w[j] = dx * (h10 * main.c0[j] + h11 * main.c1[j]);
    w[i] += h00;
    w[i + 1] += h01;
    let vNoise = 0;
    for (let j = a; j <= b; j++) vNoise += (w[j] * sec.valueUnc[j]) ** 2;
    let vGap = 0;
    let dpGap = main.fit.slopeGap;
    let dxGap = main.along.valueGap;
    for (const r of results.slice(1)) {
      vGap = Math.max(vGap, Math.abs(r.value - main.value));
      if (r.fit) dpGap = Math.max(dpGap, Math.abs(r.fit.slope - main.fit.slope));
      if (r.along) dxGap = Math.max(dxGap, Math.abs(r.along.value - main.along.value));
    }
    const v = main.value;
    const back = 1.5 * Math.sqrt(Math.abs(v));
    const y = delinearise(v);
    const vUnc = Math.hypot(Math.sqrt(vNoise), vGap);
    let z = 0;
    for (let j = a; j <= b; j++) z += w[j] * sec.z[j];
    const curves = new Set<number>([i, i + 1]);
    for (let r = main.lo; r <= main.hi; r++) curves.add(eligible[r]);
    return {
      ok: true,
      point: {
        y,
        yUncertainty: Math.abs(delinearise(Math.abs(v) + vUnc) - Math.abs(y)),
        dp: back * main.fit.slope,
        dpUncertainty: back * Math.hypot(main.fit.slopeNoise, dpGap),
        dx: back * main.along.value,
        dxUncertainty: back * Math.hypot(main.along.valueNoise, dxGap),
        z: delinearise(z),
        lower: i,
        curves: [...curves].sort((x, y) => x - y),
      },
    };
  }

  /** The interval [i, i + 1] holding p and the run a..b of measured curves around it. */
  private locate(
    p: number,
    q: Float64Array,
  ): { ok: true; i: number; a: number; b: number } | { ok: false; problem: AcrossProblem } {
    const ps = this.params;
    const m = ps.length;
    if (m < 3) return { ok: false, problem: { kind: 'few', first: 0, last: m - 1 } };
    const tol = 1e-9 * (Math.abs(ps[0]) + Math.abs(ps[m - 1]) + 1);
    if (p < ps[0] - tol) return { ok: false, problem: { kind: 'outside', side: 'below' } };
    if (p > ps[m - 1] + tol) return { ok: false, problem: { kind: 'outside', side: 'above' } };
    let i = 0;
    while (i + 2 < m && ps[i + 1] <= p + tol) i++;
    // On a curve, take whichever neighbouring interval is measured.
    if (Math.abs(p - ps[i + 1]) <= tol && i + 2 < m && isNaN(q[i]) && !isNaN(q[i + 2])) i++;
    if (Math.abs(p - ps[i]) <= tol && i > 0 && isNaN(q[i + 1]) && !isNaN(q[i - 1])) i--;
    if (isNaN(q[i])) return { ok: false, problem: { kind: 'missing', curve: i } };
    if (isNaN(q[i + 1])) return { ok: false, problem: { kind: 'missing', curve: i + 1 } };
    let a = i;
    let b = i + 1;
    while (a > 0 && !isNaN(q[a - 1])) a--;
    while (b + 1 < m && !isNaN(q[b + 1])) b++;
    if (b - a + 1 < 3) return { ok: false, problem: { kind: 'few', first: a, last: b } };
    return { ok: true, i, a, b };
  }

  /**
   * Index range (into eligible) of up to `size` curves nearest p, slid by `shift` where there is
   * room; where there is none, a three-curve set slid instead, so that one-sided estimates still
   * get compared.
   */
  private nearest(
    p: number,
    eligible: readonly number[],
    size: number,
    shift: number,
  ): [number, number] {
    const ps = this.params;
    let home = 0;
    for (let r = 1; r < eligible.length; r++) {
      if (Math.abs(ps[eligible[r]] - p) < Math.abs(ps[eligible[home]] - p)) home = r;
    }
    const pick = (n: number, by: number): [number, number] => {
      let lo = home;
      let hi = home;
      while (hi - lo + 1 < n) {
        const left = lo > 0 ? p - ps[eligible[lo - 1]] : Infinity;
        const right = hi + 1 < eligible.length ? ps[eligible[hi + 1]] - p : Infinity;
        if (left === Infinity && right === Infinity) break;
        if (left <= right) lo--;
        else hi++;
      }
      const start = Math.min(Math.max(lo + by, 0), eligible.length - (hi - lo + 1));
      return [start, start + hi - lo];
    };
    const n = Math.min(size, eligible.length);
    const plain = pick(n, 0);
    if (shift === 0) return plain;
    const slid = pick(n, shift);
    return slid[0] === plain[0] && n > 3 ? pick(3, shift) : slid;
  }

  /** Value and slope at p of the polynomial over eligible[lo..hi], with noise and gaps. */
  private fitAt(
    p: number,
    eligible: readonly number[],
    lo: number,
    hi: number,
    q: Float64Array,
    unc: Float64Array,
  ): {
    value: number;
    slope: number;
    valueNoise: number;
    slopeNoise: number;
    valueGap: number;
    slopeGap: number;
  } | null {
    const n = hi - lo + 1;
    for (let r = 0; r < n; r++) {
      const j = eligible[lo + r];
      this.x[r] = this.params[j] - p;
      this.y[r] = q[j];
      this.u[r] = unc[j];
    }
    const fit = polynomialAtZero(this.x, this.y, this.u, n);
    if (!fit) return null;
    let value = 0;
    let slope = 0;
    let valueNoise = 0;
    let slopeNoise = 0;
    for (let r = 0; r < n; r++) {
      value += fit.valueWeights[r] * this.y[r];
      slope += fit.slopeWeights[r] * this.y[r];
      valueNoise += (fit.valueWeights[r] * this.u[r]) ** 2;
      slopeNoise += (fit.slopeWeights[r] * this.u[r]) ** 2;
    }
    return {
      value,
      slope,
      valueNoise: Math.sqrt(valueNoise),
      slopeNoise: Math.sqrt(slopeNoise),
      valueGap: fit.valueGap,
      slopeGap: fit.slopeGap,
    };
  }

  /**
   * Writes into out the coefficients over curves of the Hermite knot slope at curve k: the
   * derivative of the polynomial over up to `size` curves within a..b (live ones, apart from k
   * itself), interpolating for exact values and least squares for noisy ones, then limited as
   * Hyman: at most three times the smaller neighbouring secant, zero at a local extremum.
   */
  private knotSlope(
    k: number,
    a: number,
    b: number,
    size: number,
    shift: number,
    sec: Section,
    out: Float64Array,
  ): void {
    const ps = this.params;
    const q = sec.value;
    out.fill(0);
    let la = k;
    let lb = k;
    while (la > a && sec.live[la - 1]) la--;
    while (lb < b && sec.live[lb + 1]) lb++;
    let n = Math.min(size, lb - la + 1);
    if (size <= 3) n = Math.min(n, lb - la);
    if (n < 2) {
      // Too few live curves: take known curves regardless; the limit below then decides.
      n = Math.min(3, b - a + 1);
      la = a;
      lb = b;
    }
    let start = Math.min(Math.max(k - (n >> 1) + shift, la), lb - n + 1);
    if (shift !== 0 && n > 3 && start === Math.min(Math.max(k - (n >> 1), la), lb - n + 1)) {
      n = 3;
      start = Math.min(Math.max(k - 1 + shift, la), lb - 2);
    }
    if (start > k || start + n - 1 < k) return;
    for (let r = 0; r < n; r++) {
      this.x[r] = ps[start + r] - ps[k];
      this.y[r] = q[start + r];
      this.u[r] = sec.valueUnc[start + r];
    }
    const w =
      polynomialAtZero(this.x, this.y, this.u, n)?.slopeWeights ??
      lagrangeSlopeWeights(this.x.subarray(0, n), 0);
    let g = 0;
    for (let r = 0; r < n; r++) {
      out[start + r] = w[r];
      g += w[r] * q[start + r];
    }
    const left = k > a ? (q[k] - q[k - 1]) / (ps[k] - ps[k - 1]) : NaN;
    const right = k < b ? (q[k + 1] - q[k]) / (ps[k + 1] - ps[k]) : NaN;
    const ref = isNaN(right) ? left : right;
    if (left * right <= 0 || g * ref <= 0) {
      out.fill(0);
      return;
    }
    const useLeft = isNaN(right) || (!isNaN(left) && Math.abs(left) < Math.abs(right));
    const bound = Math.abs(useLeft ? left : right);
    if (Math.abs(g) <= 3 * bound) return;
    const from = useLeft ? k - 1 : k;
    const d = ps[from + 1] - ps[from];
    out.fill(0);
    out[from] = -3 / d;
    out[from + 1] = 3 / d;
  }
}

/** Per-curve quantities in Ia^(2/3) (sign kept), where the 3/2-power law is linear. */
function linearise(samples: readonly (CurveSample | null)[]): Section {
  const m = samples.length;
  const sec: Section = {
    value: new Float64Array(m),
    valueUnc: new Float64Array(m),
    along: new Float64Array(m),
    alongUnc: new Float64Array(m),
    z: new Float64Array(m),
    live: new Uint8Array(m),
  };
  for (let j = 0; j < m; j++) {
    const s = samples[j];
    if (!s) {
      sec.value[j] = sec.valueUnc[j] = sec.along[j] = sec.alongUnc[j] = sec.z[j] = NaN;
      continue;
    }
    const live = s.y > LIVE_MARGIN * s.yUncertainty;
    sec.live[j] = live ? 1 : 0;
    sec.value[j] = power(s.y, 2 / 3);
    sec.valueUnc[j] = power(Math.abs(s.y) + s.yUncertainty, 2 / 3) - power(Math.abs(s.y), 2 / 3);
    // A cut-off curve's slope in Ia^(2/3) would be 0/0; it is flat there.
    const gain = live ? (2 / 3) * s.y ** (-1 / 3) : 0;
    sec.along[j] = gain * s.slope;
    sec.alongUnc[j] = gain * s.slopeUncertainty;
    sec.z[j] = power(s.z, 2 / 3);
  }
  return sec;
}

/** |v|^e with the sign of v. */
function power(v: number, e: number): number {
  return Math.sign(v) * Math.abs(v) ** e;
}

/** Inverse of the linearisation. */
function delinearise(v: number): number {
  return power(v, 1.5);
}
