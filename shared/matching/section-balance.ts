import { compareReadings } from './compare-readings';
import type { ResolvedCriteria } from './matching-criteria';
import type { ValveFeatures } from './valve-features';

/** Section 1 against section 2 of one double triode at one operating point. */
export interface SectionPointBalance {
  /** Operating point label. */
  label: string;
  /** Ia difference of the sections, % of their mean (null at equal-current points). */
  iaPercent: number | null;
  /** gm difference of the sections, % of their mean. */
  gmPercent: number;
}

/** How far the two sections of a double triode are apart. */
export interface SectionBalance {
  /** Per operating point. */
  points: SectionPointBalance[];
  /** RMS relative Ia difference of the sections over the window, % (null: no window). */
  curvePercent: number | null;
  /**
   * The imbalance the filter and the balance weight use, %: the largest of the differences the
   * criteria weigh (Ia at fixed-bias points if the Ia weight is above 0, gm if the gm weight is,
   * the curves if the curve weight is).
   */
  imbalancePercent: number;
}

/**
 * Section balance of a double triode: the same differences the matching distance uses (% of the
 * mean of the two sections), section 1 against section 2. Null without readable section 2.
 */
export function sectionBalance(
  f: ValveFeatures,
  criteria: ResolvedCriteria,
): SectionBalance | null {
  if (!f.section2) return null;
  const c = compareReadings([f.section1], [f.section2], criteria);
  let worst = 0;
  for (const p of c.points) {
    if (criteria.iaWeight > 0 && p.iaPercent !== null) worst = Math.max(worst, p.iaPercent);
    if (criteria.gmWeight > 0) worst = Math.max(worst, p.gmPercent);
  }
  if (criteria.curveWeight > 0 && c.curvePercent !== null) worst = Math.max(worst, c.curvePercent);
  return {
    points: c.points.map((p) => ({
      label: p.label,
      iaPercent: p.iaPercent,
      gmPercent: p.gmPercent,
    })),
    curvePercent: c.curvePercent,
    imbalancePercent: worst,
  };
}
