import { invertHankel } from './hankel-inverse';

const moments = new Float64Array(7);
const squaredMoments = new Float64Array(7);
const inverse = new Float64Array(16);
const lowInverse = new Float64Array(16);

/** A local polynomial fit of one curve around one abscissa. Units: those of x and y. */
export interface LocalFit {
  /** Fitted value at the centre. */
  value: number;
  /** Fitted slope dy/dx at the centre. */
  slope: number;
  /** Noise gain of the value: its standard deviation per unit of point noise sigma. */
  valueGain: number;
  /** Noise gain of the slope, per unit of point noise sigma (1/x). */
  slopeGain: number;
  /** Weighted residual scatter of the fit, same unit as y (0 unless asked for). */
  residualSigma: number;
  /** |value - value of the fit one degree lower|: a truncation-error indicator (0 unless asked). */
  valueOrderGap: number;
  /** |slope - slope of the fit one degree lower| (0 unless asked). */
  slopeOrderGap: number;
  /** Fitted second channel (screen current) at the centre. */
  z: number;
  /** Slope of the second channel. */
  zSlope: number;
}

/**
 * Fits a polynomial (cubic where the window allows) by weighted least squares to the points
 * from..to (inclusive, sorted by x) around x0, with tricube weights on distance (LOESS,
 * Cleveland 1979). `full` adds the residual scatter and the gaps to the fit one degree lower,
 * which the window search does not need. Returns null when the window holds fewer than two
 * distinct abscissas. Written for speed: it runs for every knot of every curve on each update.
 */
export function fitLocalPolynomial(
  xs: ArrayLike<number>,
  ys: ArrayLike<number>,
  zs: ArrayLike<number>,
  from: number,
  to: number,
  x0: number,
  full = true,
): LocalFit | null {
  let distinct = 1;
  for (let i = from + 1; i <= to && distinct < 5; i++) if (xs[i] !== xs[i - 1]) distinct++;
  if (distinct < 2) return null;
  const degree = Math.max(1, Math.min(3, distinct - 2));
  const h = 1.1 * Math.max(x0 - xs[from], xs[to] - x0);
  if (!(h > 0)) return null;
  const inv = 1 / h;
  let s0 = 0,
    s1 = 0,
    s2 = 0,
    s3 = 0,
    s4 = 0,
    s5 = 0,
    s6 = 0;
  let q0 = 0,
    q1 = 0,
    q2 = 0,
    q3 = 0,
    q4 = 0,
    q5 = 0,
    q6 = 0;
  let y0 = 0,
    y1 = 0,
    y2 = 0,
    y3 = 0;
  let z0 = 0,
    z1 = 0,
    z2 = 0,
    z3 = 0;
  for (let i = from; i <= to; i++) {
    const t = (xs[i] - x0) * inv;
    const at = t < 0 ? -t : t;
    const u = 1 - at * at * at;
    const w = u * u * u;
    const t2 = t * t;
    const t3 = t2 * t;
    const ww = w * w;
    s0 += w;
    s1 += w * t;
    s2 += w * t2;
    s3 += w * t3;
    s4 += w * t2 * t2;
    s5 += w * t2 * t3;
    s6 += w * t3 * t3;
    q0 += ww;
    q1 += ww * t;
    q2 += ww * t2;
    q3 += ww * t3;
    q4 += ww * t2 * t2;
    q5 += ww * t2 * t3;
    q6 += ww * t3 * t3;
    const y = ys[i];
    const z = zs[i];
    y0 += w * y;
    y1 += w * t * y;
    y2 += w * t2 * y;
    y3 += w * t3 * y;
    z0 += w * z;
    z1 += w * t * z;
    z2 += w * t2 * z;
    z3 += w * t3 * z;
  }
  const s = moments;
  const q = squaredMoments;
  s[0] = s0;
  s[1] = s1;
  s[2] = s2;
  s[3] = s3;
  s[4] = s4;
  s[5] = s5;
  s[6] = s6;
  q[0] = q0;
  q[1] = q1;
  q[2] = q2;
  q[3] = q3;
  q[4] = q4;
  q[5] = q5;
  q[6] = q6;
  const n = degree + 1;
  const a = inverse;
  if (!invertHankel(s, n, a, 4)) return null;
  const b0 = a[0] * y0 + a[1] * y1 + a[2] * y2 + a[3] * y3;
  const b1 = a[4] * y0 + a[5] * y1 + a[6] * y2 + a[7] * y3;
  // Covariance factors of the coefficients: A^-1 · (X'W²X) · A^-1, diagonal entries 0 and 1.
  let c0 = 0;
  let c1 = 0;
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      c0 += a[i] * q[i + j] * a[j * 4];
      c1 += a[4 + i] * q[i + j] * a[j * 4 + 1];
    }
  }
  const fit: LocalFit = {
    value: b0,
    slope: b1 * inv,
    valueGain: Math.sqrt(Math.max(c0, 0)),
    slopeGain: Math.sqrt(Math.max(c1, 0)) * inv,
    residualSigma: 0,
    valueOrderGap: 0,
    slopeOrderGap: 0,
    z: a[0] * z0 + a[1] * z1 + a[2] * z2 + a[3] * z3,
    zSlope: (a[4] * z0 + a[5] * z1 + a[6] * z2 + a[7] * z3) * inv,
  };
  if (!full) return fit;
  const low = lowInverse;
  if (!invertHankel(s, n - 1, low, 4)) return null;
  const lowValue = low[0] * y0 + low[1] * y1 + low[2] * y2 + low[3] * y3;
  const lowSlope = n - 1 > 1 ? low[4] * y0 + low[5] * y1 + low[6] * y2 + low[7] * y3 : 0;
  const b2 = a[8] * y0 + a[9] * y1 + a[10] * y2 + a[11] * y3;
  const b3 = a[12] * y0 + a[13] * y1 + a[14] * y2 + a[15] * y3;
  let traceHat = 0;
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) traceHat += a[i * 4 + j] * q[i + j];
  let rss = 0;
  for (let i = from; i <= to; i++) {
    const t = (xs[i] - x0) * inv;
    const at = t < 0 ? -t : t;
    const u = 1 - at * at * at;
    const r = ys[i] - (b0 + t * (b1 + t * (b2 + t * b3)));
    rss += u * u * u * r * r;
  }
  const dof = s0 - traceHat;
  fit.residualSigma = dof > 1e-9 ? Math.sqrt(rss / dof) : 0;
  fit.valueOrderGap = Math.abs(b0 - lowValue);
  fit.slopeOrderGap = Math.abs(b1 - lowSlope) * inv;
  return fit;
}
