import { invertHankel } from './hankel-inverse';

/** Value and slope at x = 0 of a polynomial fitted to a few nodes, as weights on their values. */
export interface PolynomialAtZero {
  /** Weight of each node's value in the value at 0. */
  valueWeights: Float64Array;
  /** Weight of each node's value in the slope at 0. */
  slopeWeights: Float64Array;
  /** |value - value of the next degree| (the previous one at the top): a truncation indicator. */
  valueGap: number;
  /** The same for the slope. */
  slopeGap: number;
}

interface DegreeFit {
  valueWeights: Float64Array;
  slopeWeights: Float64Array;
  value: number;
  slope: number;
  chiSquarePerDof: number;
}

const hankel = new Float64Array(11);
const inverse = new Float64Array(36);

/**
 * Fits a weighted least-squares polynomial to n nodes (x, y) with standard uncertainties u, of
 * the lowest degree (from 1) whose residuals the uncertainties explain (chi-square per degree
 * of freedom <= 2), up to n - 1, where it interpolates. Noisy nodes so get a low degree that
 * averages their noise; exact ones the interpolating polynomial, whose error falls fastest with
 * spacing. n <= 6; null when degenerate.
 */
export function polynomialAtZero(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  u: ArrayLike<number>,
  n: number,
): PolynomialAtZero | null {
  if (n < 2 || n > 6) return null;
  // Weights 1/u², with u floored at 1e-9 of the largest (exact nodes stay finite); all-exact
  // nodes get equal weights.
  let largest = 0;
  for (let i = 0; i < n; i++) largest = Math.max(largest, u[i]);
  const floor = largest > 0 ? largest * 1e-9 : 1;
  // Degrees from 1 up, stopping one past the first the uncertainties accept (its gap needs it).
  const fits: DegreeFit[] = [];
  let chosen = -1;
  for (let degree = 1; degree <= n - 1; degree++) {
    const fit = fitDegree(x, y, u, n, degree, floor);
    if (!fit) break;
    fits.push(fit);
    if (chosen >= 0) break;
    if (fit.chiSquarePerDof <= 2) chosen = fits.length - 1;
  }
  if (fits.length === 0) return null;
  if (chosen < 0) chosen = fits.length - 1;
  const f = fits[chosen];
  const other = fits[chosen + 1] ?? fits[chosen - 1] ?? f;
  return {
    valueWeights: f.valueWeights,
    slopeWeights: f.slopeWeights,
    valueGap: Math.abs(f.value - other.value),
    slopeGap: Math.abs(f.slope - other.slope),
  };
}

function fitDegree(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  u: ArrayLike<number>,
  n: number,
  degree: number,
  floor: number,
): DegreeFit | null {
  const size = degree + 1;
  hankel.fill(0);
  const b = [0, 0, 0, 0, 0, 0];
  for (let i = 0; i < n; i++) {
    const w = 1 / Math.max(u[i], floor) ** 2;
    let p = w;
    for (let k = 0; k <= 2 * degree; k++) {
      hankel[k] += p;
      if (k < size) b[k] += p * y[i];
      p *= x[i];
    }
  }
  if (!invertHankel(hankel, size, inverse, 6)) return null;
  const beta = [0, 0, 0, 0, 0, 0];
  for (let c = 0; c < size; c++)
    for (let k = 0; k < size; k++) beta[c] += inverse[c * 6 + k] * b[k];
  const valueWeights = new Float64Array(n);
  const slopeWeights = new Float64Array(n);
  let chi = 0;
  for (let i = 0; i < n; i++) {
    const w = 1 / Math.max(u[i], floor) ** 2;
    let g0 = 0;
    let g1 = 0;
    let fit = 0;
    let p = 1;
    for (let c = 0; c < size; c++) {
      g0 += inverse[c] * p;
      g1 += inverse[6 + c] * p;
      fit += beta[c] * p;
      p *= x[i];
    }
    valueWeights[i] = g0 * w;
    slopeWeights[i] = g1 * w;
    chi += w * (y[i] - fit) ** 2;
  }
  const dof = n - size;
  return {
    valueWeights,
    slopeWeights,
    value: beta[0],
    slope: beta[1],
    chiSquarePerDof: dof > 0 ? chi / dof : 0,
  };
}
