import type { SweepPoint } from '../domain/sweep';

/** Points of one curve, sorted by abscissa. Units: V and mA. */
export interface PointGroup {
  /** The curve's parameter (Vg1 of an anode curve, Va of a transfer curve): mean of its points, V. */
  keyVolts: number;
  /** Abscissa (Va of an anode curve, Vg1 of a transfer curve), ascending, V. */
  xs: Float64Array;
  /** Anode current, mA. */
  ys: Float64Array;
  /** Screen current, mA. */
  zs: Float64Array;
}

/**
 * Groups points into curves by a voltage held constant along each curve: 'vg1' for anode
 * families (one curve per grid step; curve indices are ignored, so sweeps can be merged), 'va'
 * for transfer sweeps. Keys closer than the tolerance form one curve; the default tolerance is
 * 2 % of the span of keys, at least 0.02 V. Non-finite readings are dropped. The result does not
 * depend on the order of the points.
 */
export function groupCurves(
  points: readonly SweepPoint[],
  by: 'vg1' | 'va',
  toleranceVolts?: number,
): PointGroup[] {
  const rows = points
    .filter(
      (p) =>
        Number.isFinite(p.vaVolts) &&
        Number.isFinite(p.vg1Volts) &&
        Number.isFinite(p.iaMilliamps) &&
        Number.isFinite(p.ig2Milliamps),
    )
    .map((p) =>
      by === 'vg1'
        ? [p.vg1Volts, p.vaVolts, p.iaMilliamps, p.ig2Milliamps]
        : [p.vaVolts, p.vg1Volts, p.iaMilliamps, p.ig2Milliamps],
    )
    .sort((a, b) => a[0] - b[0] || a[1] - b[1] || a[2] - b[2] || a[3] - b[3]);
  if (rows.length === 0) return [];
  const span = rows[rows.length - 1][0] - rows[0][0];
  const tol = toleranceVolts ?? Math.max(0.02, 0.02 * span);
  const clusters: number[][][] = [[rows[0]]];
  for (let i = 1; i < rows.length; i++) {
    if (rows[i][0] - rows[i - 1][0] > tol) clusters.push([]);
    clusters[clusters.length - 1].push(rows[i]);
  }
  return clusters.map((c) => {
    const keyVolts = c.reduce((acc, r) => acc + r[0], 0) / c.length;
    c.sort((a, b) => a[1] - b[1] || a[2] - b[2] || a[3] - b[3] || a[0] - b[0]);
    return {
      keyVolts,
      xs: Float64Array.from(c, (r) => r[1]),
      ys: Float64Array.from(c, (r) => r[2]),
      zs: Float64Array.from(c, (r) => r[3]),
    };
  });
}
