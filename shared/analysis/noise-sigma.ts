/** A robust estimate of the point noise of one curve. */
export interface NoiseSigma {
  /** Standard deviation of the point noise, unit of y. */
  sigma: number;
  /** Number of pseudo-residuals behind the estimate (0: no estimate). */
  count: number;
}

/**
 * Estimates the point noise of a smooth curve from pseudo-residuals: each point against the cubic
 * through its four neighbours, normalised to unit noise gain (a higher-order form of the
 * difference estimator of Gasser, Sroka and Jennen-Steinmetz, Biometrika 73, 1986, so that
 * curvature between sparse points does not pass for noise), plus repeated readings at the same
 * abscissa. sigma = 1.4826 · median |pseudo-residual|, robust to the few points at a knee.
 * Stretches at or below zero (cut-off, clipped by the converter) are left out.
 * xs must be sorted ascending.
 */
export function estimateNoiseSigma(xs: ArrayLike<number>, ys: ArrayLike<number>): NoiseSigma {
  const ux: number[] = [];
  const uy: number[] = [];
  const uc: number[] = [];
  const residuals: number[] = [];
  for (let i = 0; i < xs.length;) {
    let j = i;
    let sum = 0;
    while (j < xs.length && xs[j] === xs[i]) sum += ys[j++];
    const c = j - i;
    const mean = sum / c;
    if (c > 1) for (let k = i; k < j; k++) residuals.push((ys[k] - mean) * Math.sqrt(c / (c - 1)));
    ux.push(xs[i]);
    uy.push(mean);
    uc.push(c);
    i = j;
  }
  for (let i = 2; i + 2 < ux.length; i++) {
    const nodes = [i - 2, i - 1, i + 1, i + 2];
    // Readings at or below zero are clipped by the converter (cut-off): their scatter is not
    // the noise, so stencils touching them are left out.
    if (uy[i] <= 0 || nodes.some((k) => uy[k] <= 0)) continue;
    let predicted = 0;
    let gain = 1 / uc[i];
    for (const m of nodes) {
      let l = 1;
      for (const k of nodes) if (k !== m) l *= (ux[i] - ux[k]) / (ux[m] - ux[k]);
      predicted += l * uy[m];
      gain += (l * l) / uc[m];
    }
    residuals.push((uy[i] - predicted) / Math.sqrt(gain));
  }
  if (residuals.length === 0) return { sigma: 0, count: 0 };
  const abs = residuals.map(Math.abs).sort((a, b) => a - b);
  const mid = abs.length >> 1;
  const median = abs.length % 2 ? abs[mid] : (abs[mid - 1] + abs[mid]) / 2;
  return { sigma: 1.4826 * median, count: residuals.length };
}
