import { refuse, type Refusal } from '../analysis/refusal';
import { compareIds, exclusion } from './group-valves';
import { groupSpread } from './group-spread';
import type { ResolvedCriteria } from './matching-criteria';
import type { ValveFeatures } from './valve-features';
import { valveDistance, type ValveDistance } from './valve-distance';

/** A candidate partner for one valve. */
export interface PartnerMatch {
  /** Candidate id. */
  id: string;
  /** Candidate label. */
  label: string;
  /** Distance to the valve, and what it is made of. */
  distance: ValveDistance;
  /** Whether the two would make an acceptable pair under the tolerance. */
  withinTolerance: boolean;
  /** What is over the tolerance for the pair. */
  exceeds: string[];
}

/**
 * The best partners for one valve in a pool, nearest first (ties by id), at most limit of them.
 * The valve itself (same id) and candidates the criteria rule out (no section 2 where needed,
 * section imbalance over the limit) are skipped; a valve the criteria rule out gets a refusal.
 * The distance is the one grouping uses, so the first candidate is the valve's nearest
 * neighbour in the same sense as a matched pair.
 */
export function findPartners(
  target: ValveFeatures,
  pool: readonly ValveFeatures[],
  criteria: ResolvedCriteria,
  limit = 10,
): { ok: true; partners: PartnerMatch[] } | Refusal {
  const ruledOut = exclusion(target, criteria);
  if (ruledOut) return refuse(`${target.label} cannot be matched: ${ruledOut.detail}`);
  const ranked = pool
    .filter((f) => f.id !== target.id && exclusion(f, criteria) === null)
    .map((f) => {
      const spread = groupSpread([target, f], criteria);
      return {
        id: f.id,
        label: f.label,
        distance: valveDistance(target, f, criteria),
        withinTolerance: spread.acceptable,
        exceeds: spread.exceeds,
      };
    });
  ranked.sort(
    (a, b) => a.distance.distancePercent - b.distance.distancePercent || compareIds(a.id, b.id),
  );
  return { ok: true, partners: ranked.slice(0, Math.max(0, limit)) };
}
