import {
  groupSpread,
  prepareValves,
  resolveCriteria,
  valveDistance,
} from '../../shared/matching/index';
import { candidatesOf, matchingRefused, toMatchingCriteria, type PoolValve } from './matching-pool';
import type { MatchCriteriaInput } from './matching.schemas';

/**
 * Spreads and score of a set and every member's readings at the operating points, computed
 * from the members' families under the criteria; 422 if a member cannot be read.
 */
export function setFigures(members: readonly PoolValve[], criteria: MatchCriteriaInput) {
  const resolved = resolveCriteria(toMatchingCriteria(criteria, members.length));
  if (!resolved.ok) throw matchingRefused(resolved.reason);
  const { features, excluded } = prepareValves(candidatesOf(members), resolved.criteria);
  if (excluded.length) {
    throw matchingRefused(excluded.map((e) => `${e.label}: ${e.detail}`).join('; '));
  }
  const spread = groupSpread(features, resolved.criteria);
  // The set's score is its worst pair, as a run scores its groups.
  let scorePercent = 0;
  for (let a = 0; a < features.length; a++) {
    for (let b = a + 1; b < features.length; b++) {
      const d = valveDistance(features[a], features[b], resolved.criteria).distancePercent;
      scorePercent = Math.max(scorePercent, d);
    }
  }
  return {
    scorePercent,
    acceptable: spread.acceptable,
    tolerancePercent: resolved.criteria.tolerancePercent,
    curveSpreadPercent: spread.curveSpreadPercent,
    exceeds: spread.exceeds,
    points: spread.points,
    members: features.map((f) => ({
      valveId: Number(f.id),
      readings: f.section1.points.map((r, i) => ({
        label: resolved.criteria.points[i].label,
        ...r,
      })),
    })),
  };
}
