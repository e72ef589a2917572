import { refuse, type Refusal } from '../analysis/refusal';
import { formGroups } from './form-groups';
import { groupSpread, type PointSpread } from './group-spread';
import type { ResolvedCriteria } from './matching-criteria';
import type { MatchingOptions } from './min-cost-matching';
import { sectionBalance } from './section-balance';
import type { ValveFeatures } from './valve-features';
import { distanceMatrix } from './valve-distance';

/** A valve as it appears in a result. */
export interface MatchMember {
  /** Unique id. */
  id: string;
  /** Label shown to the user. */
  label: string;
  /** Its own section imbalance, % (null for single-section valves or section 2 not read). */
  sectionImbalancePercent: number | null;
}

/** One matched group. */
export interface MatchGroup {
  /** Members, by id. */
  members: MatchMember[];
  /** The group's score: the largest distance between two of its members, % (lower is better). */
  scorePercent: number;
  /** Whether every weighed spread is within the tolerance. */
  acceptable: boolean;
  /** Spreads at each operating point (and section), % of the group mean. */
  points: PointSpread[];
  /** Largest curve difference between two members over the window, % (null: no window). */
  curveSpreadPercent: number | null;
  /** What is over the tolerance; empty for an acceptable group. */
  exceeds: string[];
}

/** Why a valve is in no group. */
export type LeftOverReason =
  'pool-size' | 'no-data' | 'wrong-type' | 'no-second-section' | 'section-imbalance';

/** A valve in no group, with the reason. */
export interface LeftOverValve {
  /** Unique id. */
  id: string;
  /** Label shown to the user. */
  label: string;
  /** Why. */
  reason: LeftOverReason;
  /** The reason in words. */
  detail: string;
}

/** The outcome of grouping a pool. */
export interface MatchResult {
  /** Always true: tells a result from a refusal. */
  ok: true;
  /** Groups: acceptable first, then by score, then by the id of the first member. */
  groups: MatchGroup[];
  /** Valves in no group, by id. */
  leftOver: LeftOverValve[];
  /** Sum of the group scores, %: what the grouping minimises. */
  totalScorePercent: number;
}

/**
 * Groups a pool of valves whose features were extracted under the same criteria. Valves the
 * criteria rule out (no section 2 where needed, section imbalance over the limit) and those
 * passed in as excluded are left over with their reason; the rest are grouped by formGroups on
 * the distance matrix; members that do not fill a last group are left over as 'pool-size'.
 * Groups over the tolerance stay groups, marked not acceptable, so the user sees how close the
 * nearest set is. The result does not depend on the order of the pool: valves are taken in id
 * order, and every tie is broken by it.
 */
export function groupValves(
  pool: readonly ValveFeatures[],
  criteria: ResolvedCriteria,
  excluded: readonly LeftOverValve[] = [],
  options: MatchingOptions = {},
): MatchResult | Refusal {
  const ids = new Set<string>();
  for (const v of [...pool, ...excluded]) {
    if (ids.has(v.id)) return refuse(`valve id ${v.id} appears twice in the pool`);
    ids.add(v.id);
  }
  const leftOver: LeftOverValve[] = [...excluded];
  const eligible: ValveFeatures[] = [];
  const imbalance = new Map<string, number | null>();
  for (const f of [...pool].sort((a, b) => compareIds(a.id, b.id))) {
    const why = exclusion(f, criteria, imbalance);
    if (why) leftOver.push({ id: f.id, label: f.label, ...why });
    else eligible.push(f);
  }
  const costs = distanceMatrix(eligible, criteria);
  const partition = formGroups(costs, criteria.groupSize, options);
  const member = (i: number): MatchMember => ({
    id: eligible[i].id,
    label: eligible[i].label,
    sectionImbalancePercent: imbalance.get(eligible[i].id) ?? null,
  });
  const groups: MatchGroup[] = partition.groups.map((g) => {
    const spread = groupSpread(
      g.map((i) => eligible[i]),
      criteria,
    );
    return { members: g.map(member), scorePercent: costs.groupCost(g), ...spread };
  });
  groups.sort(
    (a, b) =>
      Number(b.acceptable) - Number(a.acceptable) ||
      a.scorePercent - b.scorePercent ||
      compareIds(a.members[0].id, b.members[0].id),
  );
  const k = criteria.groupSize;
  for (const i of partition.leftOver) {
    leftOver.push({
      id: eligible[i].id,
      label: eligible[i].label,
      reason: 'pool-size',
      detail:
        `${partition.leftOver.length} of ${eligible.length} matchable valves do not fill ` +
        `another group of ${k}; this one fits the groups least`,
    });
  }
  leftOver.sort((a, b) => compareIds(a.id, b.id));
  return {
    ok: true,
    groups,
    leftOver,
    totalScorePercent: groups.reduce((t, g) => t + g.scorePercent, 0),
  };
}

/** Ids in a fixed, locale-independent order (UTF-16 code units). */
export function compareIds(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}

/** Why the criteria rule a valve out of grouping, or null; notes its section imbalance. */
export function exclusion(
  f: ValveFeatures,
  criteria: ResolvedCriteria,
  imbalance?: Map<string, number | null>,
): Pick<LeftOverValve, 'reason' | 'detail'> | null {
  const balance = sectionBalance(f, criteria);
  imbalance?.set(f.id, balance ? balance.imbalancePercent : null);
  const needsSecond =
    criteria.sections === 'both' ||
    Number.isFinite(criteria.maxSectionImbalancePercent) ||
    criteria.sectionBalanceWeight > 0;
  if (needsSecond && !balance) {
    return {
      reason: 'no-second-section',
      detail: f.section2Problem ?? 'section 2 was not measured, and the criteria need it',
    };
  }
  if (balance && balance.imbalancePercent > criteria.maxSectionImbalancePercent) {
    return {
      reason: 'section-imbalance',
      detail:
        `its sections differ by ${balance.imbalancePercent.toFixed(1)} %, more than the ` +
        `${criteria.maxSectionImbalancePercent} % allowed`,
    };
  }
  return null;
}
