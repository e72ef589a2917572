/**
 * Matching tolerances as the trade commonly uses them: common practice, no single source
 * (team reference sheet §6): ±5 % is a usual target, ±2-3 % tight, ±10 % loose. Emberline reads
 * a tolerance as the largest allowed spread (max - min) across a group, in % of the group mean,
 * which is the stricter of the two readings of "±" and the one a buyer of a matched set expects.
 */
export const MATCH_TOLERANCES = {
  /** Tight matching, % (common practice: 2-3 %; the middle of that range). */
  tightPercent: 2.5,
  /** Usual matching target, % (common practice). */
  usualPercent: 5,
  /** Loose matching, % (common practice). */
  loosePercent: 10,
} as const;

/** Tolerance used when the criteria give none, % (common practice: the usual target). */
export const DEFAULT_TOLERANCE_PERCENT = MATCH_TOLERANCES.usualPercent;
