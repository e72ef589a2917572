import type { ResolvedCriteria } from './matching-criteria';
import type { SectionReadings, ValveFeatures } from './valve-features';

/**
 * Curve agreement of two valves whose curves share no grid node inside the window, %: far
 * outside any tolerance, and finite so that the matching stays well defined.
 */
export const NO_OVERLAP_PERCENT = 100;

/** Difference of two readings in % of their mean (0 when both are 0). */
export function relativeDifferencePercent(x: number, y: number): number {
  const s = Math.abs(x) + Math.abs(y);
  return s > 0 ? (200 * Math.abs(x - y)) / s : 0;
}

/** The difference of two valves (or two sections) at one operating point. */
export interface PointDifference {
  /** Operating point label. */
  label: string;
  /** Which section of each valve, 1 or 2. */
  section: 1 | 2;
  /** Ia difference, % of the mean (null at equal-current points, where Ia is equal by design). */
  iaPercent: number | null;
  /** gm difference, % of the mean. */
  gmPercent: number;
  /** Grid voltage difference, V (the bias each needs at an equal-current point; else 0). */
  vg1Volts: number;
}

/** How two sets of section readings differ, quantity by quantity. */
export interface ReadingComparison {
  /** Per section and operating point. */
  points: PointDifference[];
  /** RMS of the relative Ia difference over the shared window nodes, % (null: no window). */
  curvePercent: number | null;
  /** Window nodes compared (both answer and their mean Ia lies in the window). */
  curveNodes: number;
  /** Weighted mean of the mean Ia difference, mean gm difference and curve difference, %. */
  matchPercent: number;
}

/** The sections a valve is compared on under the criteria. */
export function comparedSections(f: ValveFeatures, criteria: ResolvedCriteria): SectionReadings[] {
  if (criteria.sections === 'first') return [f.section1];
  if (!f.section2) throw new Error(`valve ${f.id} has no readable section 2 to compare`);
  return [f.section1, f.section2];
}

/** Compares readings section by section (a[s] against b[s]). */
export function compareReadings(
  a: readonly SectionReadings[],
  b: readonly SectionReadings[],
  criteria: ResolvedCriteria,
  sectionNumbers: readonly (1 | 2)[] = a.map((_, s) => (s + 1) as 1 | 2),
): ReadingComparison {
  const points: PointDifference[] = [];
  let iaSum = 0;
  let iaCount = 0;
  let gmSum = 0;
  for (let s = 0; s < a.length; s++) {
    criteria.points.forEach((p, i) => {
      const x = a[s].points[i];
      const y = b[s].points[i];
      const ia =
        p.kind === 'fixed-bias' ? relativeDifferencePercent(x.iaMilliamps, y.iaMilliamps) : null;
      const gm = relativeDifferencePercent(x.gmMicrosiemens, y.gmMicrosiemens);
      if (ia !== null) {
        iaSum += ia;
        iaCount++;
      }
      gmSum += gm;
      points.push({
        label: p.label,
        section: sectionNumbers[s],
        iaPercent: ia,
        gmPercent: gm,
        vg1Volts: p.kind === 'fixed-bias' ? 0 : Math.abs(x.vg1Volts - y.vg1Volts),
      });
    });
  }
  const curve = criteria.window ? curveDifference(a, b, criteria) : null;
  const gmCount = a.length * criteria.points.length;
  return {
    points,
    curvePercent: curve ? curve.percent : null,
    curveNodes: curve ? curve.nodes : 0,
    matchPercent: combine(iaSum, iaCount, gmSum, gmCount, curve ? curve.percent : 0, criteria),
  };
}

/** The match part of the distance without the per-point detail: the fast path for matrices. */
export function matchPercent(
  a: readonly SectionReadings[],
  b: readonly SectionReadings[],
  criteria: ResolvedCriteria,
): number {
  let iaSum = 0;
  let iaCount = 0;
  let gmSum = 0;
  const pts = criteria.points;
  for (let s = 0; s < a.length; s++) {
    const xs = a[s].points;
    const ys = b[s].points;
    for (let i = 0; i < pts.length; i++) {
      if (pts[i].kind === 'fixed-bias') {
        iaSum += relativeDifferencePercent(xs[i].iaMilliamps, ys[i].iaMilliamps);
        iaCount++;
      }
      gmSum += relativeDifferencePercent(xs[i].gmMicrosiemens, ys[i].gmMicrosiemens);
    }
  }
  const curve =
    criteria.window && criteria.curveWeight > 0 ? curveDifference(a, b, criteria).percent : 0;
  return combine(iaSum, iaCount, gmSum, a.length * pts.length, curve, criteria);
}

/** RMS of the relative Ia difference over the window nodes both sections share. */
function curveDifference(
  a: readonly SectionReadings[],
  b: readonly SectionReadings[],
  criteria: ResolvedCriteria,
): { percent: number; nodes: number } {
  const w = criteria.window!;
  let sum = 0;
  let nodes = 0;
  for (let s = 0; s < a.length; s++) {
    const xs = a[s].windowIaMilliamps;
    const ys = b[s].windowIaMilliamps;
    for (let k = 0; k < xs.length; k++) {
      const x = xs[k];
      const y = ys[k];
      const mean = (x + y) / 2;
      // NaN (not measured) fails both comparisons.
      if (!(mean >= w.iaMinMilliamps && mean <= w.iaMaxMilliamps)) continue;
      const d = relativeDifferencePercent(x, y);
      sum += d * d;
      nodes++;
    }
  }
  return { percent: nodes ? Math.sqrt(sum / nodes) : NO_OVERLAP_PERCENT, nodes };
}

function combine(
  iaSum: number,
  iaCount: number,
  gmSum: number,
  gmCount: number,
  curvePercent: number,
  c: ResolvedCriteria,
): number {
  let num = 0;
  let den = 0;
  if (iaCount > 0 && c.iaWeight > 0) {
    num += (c.iaWeight * iaSum) / iaCount;
    den += c.iaWeight;
  }
  if (gmCount > 0 && c.gmWeight > 0) {
    num += (c.gmWeight * gmSum) / gmCount;
    den += c.gmWeight;
  }
  if (c.window && c.curveWeight > 0) {
    num += c.curveWeight * curvePercent;
    den += c.curveWeight;
  }
  return den > 0 ? num / den : 0;
}
