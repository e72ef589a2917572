import { compareReadings, comparedSections } from './compare-readings';
import type { ResolvedCriteria } from './matching-criteria';
import type { ValveFeatures } from './valve-features';

/** Spread of a group at one operating point of one section. V, mA, µS, %. */
export interface PointSpread {
  /** Operating point label. */
  label: string;
  /** Section, 1 or 2. */
  section: 1 | 2;
  /** Fixed bias or equal current. */
  kind: 'fixed-bias' | 'equal-current';
  /** Anode voltage of the point, V. */
  vaVolts: number;
  /** Screen voltage of the point, V (null for triodes). */
  vg2Volts: number | null;
  /** Mean anode current of the members, mA. */
  iaMeanMilliamps: number;
  /** (max - min) of Ia in % of the mean (null at equal-current points, where it is 0 by design). */
  iaSpreadPercent: number | null;
  /** Mean gm of the members, µS. */
  gmMeanMicrosiemens: number;
  /** (max - min) of gm in % of the mean. */
  gmSpreadPercent: number;
  /** Mean grid voltage of the members, V. */
  vg1MeanVolts: number;
  /** (max - min) of the grid voltage, V (0 at fixed-bias points). */
  vg1SpreadVolts: number;
}

/** How tightly a group agrees, and whether that is within the tolerance. */
export interface GroupSpread {
  /** Per section and operating point. */
  points: PointSpread[];
  /** Largest curve difference between two members over the window, % (null: no window). */
  curveSpreadPercent: number | null;
  /** Whether every weighed spread is within the tolerance. */
  acceptable: boolean;
  /** What is over the tolerance, e.g. "Ia at idle: 6.1 % (tolerance 5 %)". */
  exceeds: string[];
}

/**
 * Spreads of a group (max - min in % of the group mean, the way a matched set is quoted) and
 * the verdict: acceptable when, for every quantity the criteria weigh, the spread is within the
 * tolerance: Ia at fixed-bias points, gm at every point, and the largest pairwise curve
 * difference over the window. For two valves each spread equals the difference the distance uses.
 */
export function groupSpread(
  members: readonly ValveFeatures[],
  criteria: ResolvedCriteria,
): GroupSpread {
  const sections = members.map((m) => comparedSections(m, criteria));
  const tol = criteria.tolerancePercent;
  const points: PointSpread[] = [];
  const exceeds: string[] = [];
  const sectionCount = sections[0]?.length ?? 0;
  const over = (what: string, spread: number) => {
    if (spread > tol + 1e-9) exceeds.push(`${what}: ${spread.toFixed(1)} % (tolerance ${tol} %)`);
  };
  for (let s = 0; s < sectionCount; s++) {
    criteria.points.forEach((p, i) => {
      const readings = sections.map((sec) => sec[s].points[i]);
      const ia = spread(readings.map((r) => r.iaMilliamps));
      const gm = spread(readings.map((r) => r.gmMicrosiemens));
      const vg1 = readings.map((r) => r.vg1Volts);
      const where = sectionCount > 1 ? `${p.label}, section ${s + 1}` : p.label;
      const fixed = p.kind === 'fixed-bias';
      if (fixed && criteria.iaWeight > 0) over(`Ia at ${where}`, ia.percent);
      if (criteria.gmWeight > 0) over(`gm at ${where}`, gm.percent);
      points.push({
        label: p.label,
        section: (s + 1) as 1 | 2,
        kind: p.kind,
        vaVolts: p.vaVolts,
        vg2Volts: p.vg2Volts,
        iaMeanMilliamps: ia.mean,
        iaSpreadPercent: fixed ? ia.percent : null,
        gmMeanMicrosiemens: gm.mean,
        gmSpreadPercent: gm.percent,
        vg1MeanVolts: vg1.reduce((x, y) => x + y, 0) / vg1.length,
        vg1SpreadVolts: fixed ? 0 : Math.max(...vg1) - Math.min(...vg1),
      });
    });
  }
  let curveSpreadPercent: number | null = null;
  if (criteria.window) {
    curveSpreadPercent = 0;
    for (let a = 0; a < members.length; a++) {
      for (let b = a + 1; b < members.length; b++) {
        const c = compareReadings(sections[a], sections[b], criteria).curvePercent ?? 0;
        curveSpreadPercent = Math.max(curveSpreadPercent, c);
      }
    }
    if (criteria.curveWeight > 0) over('curves over the window', curveSpreadPercent);
  }
  return { points, curveSpreadPercent, acceptable: exceeds.length === 0, exceeds };
}

function spread(xs: readonly number[]): { mean: number; percent: number } {
  const mean = xs.reduce((a, b) => a + b, 0) / xs.length;
  const range = Math.max(...xs) - Math.min(...xs);
  return { mean, percent: mean !== 0 ? (100 * range) / Math.abs(mean) : 0 };
}
