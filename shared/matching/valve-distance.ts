import {
  compareReadings,
  comparedSections,
  matchPercent,
  type ReadingComparison,
} from './compare-readings';
import { CostMatrix } from './cost-matrix';
import type { ResolvedCriteria } from './matching-criteria';
import { sectionBalance } from './section-balance';
import type { ValveFeatures } from './valve-features';

/** The distance between two valves and what it is made of. */
export interface ValveDistance extends ReadingComparison {
  /** The distance grouping minimises: matchPercent plus the section balance penalty, %. */
  distancePercent: number;
  /** Section balance weight times the mean of the two valves' section imbalances, %. */
  balancePenaltyPercent: number;
}

/** Distance between two valves with its breakdown. */
export function valveDistance(
  a: ValveFeatures,
  b: ValveFeatures,
  criteria: ResolvedCriteria,
): ValveDistance {
  const c = compareReadings(comparedSections(a, criteria), comparedSections(b, criteria), criteria);
  const penalty =
    criteria.sectionBalanceWeight === 0
      ? 0
      : (criteria.sectionBalanceWeight * (imbalance(a, criteria) + imbalance(b, criteria))) / 2;
  return { ...c, distancePercent: c.matchPercent + penalty, balancePenaltyPercent: penalty };
}

/** Distances between every two valves of a pool, %, in the order given. */
export function distanceMatrix(
  pool: readonly ValveFeatures[],
  criteria: ResolvedCriteria,
): CostMatrix {
  const sections = pool.map((f) => comparedSections(f, criteria));
  const w = criteria.sectionBalanceWeight;
  const half = pool.map((f) => (w === 0 ? 0 : (w * imbalance(f, criteria)) / 2));
  return CostMatrix.build(
    pool.length,
    (i, j) => matchPercent(sections[i], sections[j], criteria) + half[i] + half[j],
  );
}

function imbalance(f: ValveFeatures, criteria: ResolvedCriteria): number {
  const b = sectionBalance(f, criteria);
  if (!b) throw new Error(`valve ${f.id}: a section balance weight needs readable section 2`);
  return b.imbalancePercent;
}
