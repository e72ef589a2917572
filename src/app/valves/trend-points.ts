import type { QuickTestSummary, SweepFigures } from './valves-api';

/** What a trend point was measured by. */
export type TrendSource = 'sweep' | 'quick-test';

/** gm and Ia of a valve at its type's reference point from one sweep or quick test. */
export interface TrendPoint {
  source: TrendSource;
  /** Sweep or quick-test id. */
  id: number;
  /** ISO time of the measurement. */
  at: string;
  /** Mutual conductance, mA/V. */
  gmMilliampsPerVolt: number | null;
  /** Anode current, mA. */
  iaMilliamps: number | null;
  /** gm and Ia as % of the data sheet's, %. */
  gmPercent: number | null;
  iaPercent: number | null;
}

/**
 * A valve's gm and Ia at the reference point over time, oldest first: the figures of its sweeps
 * (interpolated on the measured family) and the gm part of its quick tests (measured there
 * directly). Sweeps and tests without either figure are left out.
 */
export function trendPoints(
  figures: readonly SweepFigures[],
  quickTests: readonly QuickTestSummary[],
): TrendPoint[] {
  const out: TrendPoint[] = [];
  const add = (source: TrendSource, id: number, at: string, f: SweepFigures | QuickTestSummary) => {
    if (f.gmMicrosiemens === null && f.iaMilliamps === null) return;
    out.push({
      source,
      id,
      at,
      gmMilliampsPerVolt: f.gmMicrosiemens === null ? null : f.gmMicrosiemens / 1000,
      iaMilliamps: f.iaMilliamps,
      gmPercent: f.gmPercent,
      iaPercent: f.iaPercent,
    });
  };
  for (const f of figures) add('sweep', f.sweepId, f.at, f);
  for (const t of quickTests) add('quick-test', t.id, t.at, t);
  return out.sort((a, b) => Date.parse(a.at) - Date.parse(b.at));
}
