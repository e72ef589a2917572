import type { CostMatrix } from './cost-matrix';
import { improvePartition, isBetter, type Partition } from './improve-partition';
import { EXACT_MATCHING_LIMIT, minCostMatching, type MatchingOptions } from './min-cost-matching';

/**
 * Splits a pool into groups of groupSize at a low total group cost (each group costs its largest
 * pairwise cost; members that do not fill a group are left over). Method, deterministic:
 * write the size as 2^m·r with r odd. Seed groups of r: single members when r = 1, otherwise
 * runs of r along a one-dimensional ordering (cost from a member at the edge of the pool).
 * Then m times, pair the groups by minimum-cost matching (Edmonds' blossom) on the cost of their
 * union, so pairs become quads, quads octets; an odd group out is left over. Improve that by
 * local search (improvePartition). Pools of up to MULTI_START_LIMIT members also run the local
 * search from runs of the full size along four orderings and keep the best result (ties: the
 * blossom route). Pairs are the exact optimum up to EXACT_MATCHING_LIMIT members (local search
 * cannot beat an optimum); larger groups are a heuristic, measured against brute force in the
 * tests and against random restarts in the benchmark.
 */
export function formGroups(
  costs: CostMatrix,
  groupSize: number,
  options: MatchingOptions = {},
): Partition {
  if (!Number.isInteger(groupSize) || groupSize < 2) {
    throw new Error(`group size must be a whole number of 2 or more; got ${groupSize}`);
  }
  let odd = groupSize;
  let doublings = 0;
  while (odd % 2 === 0) {
    odd /= 2;
    doublings++;
  }
  const starts: Partition[] = [];
  const anchors = farthestPoints(costs, ANCHORS);
  // The blossom route: seeds of the odd factor (single members for powers of two), doubled.
  starts.push(double(costs, seedRuns(costs, odd, anchors[0] ?? 0), doublings, options));
  // Small pools also start from plain runs of the full size along a few orderings: they rescue
  // the pools where the best pairs are not the best halves of the best groups. In large pools
  // such starts only cost time: the local search from them ends worse than from the blossom.
  const exactPairs = groupSize === 2 && costs.size <= (options.exactLimit ?? EXACT_MATCHING_LIMIT);
  if (costs.size <= MULTI_START_LIMIT && !exactPairs) {
    // Without doublings the blossom route already is the run start from the first anchor.
    for (const a of doublings ? anchors : anchors.slice(1)) {
      starts.push(seedRuns(costs, groupSize, a));
    }
  }
  let best: Partition | null = null;
  let bestCost = 0;
  let bestSum = 0;
  for (const start of starts) {
    const p = improvePartition(costs, start);
    const c = costs.partitionCost(p.groups);
    const s = p.groups.reduce((t, g) => t + costs.groupSum(g), 0);
    if (!best || isBetter(c, s, bestCost, bestSum)) {
      best = p;
      bestCost = c;
      bestSum = s;
    }
  }
  return canonical(best!);
}

/** Number of orderings (anchors) tried for the run starts. */
const ANCHORS = 4;

/** Pools up to this many members get the extra run starts. */
const MULTI_START_LIMIT = 128;

function double(
  costs: CostMatrix,
  seed: Partition,
  doublings: number,
  options: MatchingOptions,
): Partition {
  let units = seed.groups;
  const leftOver = [...seed.leftOver];
  for (let d = 0; d < doublings; d++) {
    const unitCost = units.map((u) => costs.groupCost(u));
    const mate = minCostMatching(
      units.length,
      (u, v) => mergedCost(costs, units[u], units[v], unitCost[u], unitCost[v]),
      options,
    );
    const merged: number[][] = [];
    units.forEach((u, i) => {
      if (mate[i] < 0) leftOver.push(...u);
      else if (i < mate[i]) merged.push([...u, ...units[mate[i]]]);
    });
    units = merged;
  }
  return { groups: units, leftOver };
}

/** Groups and left-over members in a fixed order: by member index, groups by first member. */
export function canonical(p: Partition): Partition {
  const groups = p.groups.map((g) => [...g].sort((a, b) => a - b));
  groups.sort((a, b) => a[0] - b[0]);
  return { groups, leftOver: [...p.leftOver].sort((a, b) => a - b) };
}

/**
 * Runs of r consecutive members along the ordering by cost from an anchor member; the members
 * past the last whole run are left over.
 */
function seedRuns(costs: CostMatrix, r: number, anchor: number): Partition {
  const n = costs.size;
  if (r === 1) return { groups: Array.from({ length: n }, (_, i) => [i]), leftOver: [] };
  const order = Array.from({ length: n }, (_, i) => i).sort(
    (a, b) => costs.at(anchor, a) - costs.at(anchor, b) || a - b,
  );
  const groups: number[][] = [];
  const whole = Math.floor(n / r) * r;
  for (let i = 0; i < whole; i += r) groups.push(order.slice(i, i + r));
  return { groups, leftOver: order.slice(whole) };
}

/**
 * Up to count members spread over the pool: the one farthest from member 0, then each time the
 * one farthest from those already taken (ties by index). Ends of the pool make good anchors.
 */
function farthestPoints(costs: CostMatrix, count: number): number[] {
  const n = costs.size;
  if (n === 0) return [];
  const near = new Float64Array(n);
  for (let j = 0; j < n; j++) near[j] = costs.at(0, j);
  const out: number[] = [];
  while (out.length < Math.min(count, n)) {
    let far = 0;
    for (let j = 1; j < n; j++) if (near[j] > near[far]) far = j;
    out.push(far);
    for (let j = 0; j < n; j++) near[j] = Math.min(near[j], costs.at(far, j));
    near[far] = -1;
  }
  return out;
}

function mergedCost(
  costs: CostMatrix,
  u: readonly number[],
  v: readonly number[],
  costU: number,
  costV: number,
): number {
  let worst = costU > costV ? costU : costV;
  for (const a of u) {
    for (const b of v) {
      const c = costs.at(a, b);
      if (c > worst) worst = c;
    }
  }
  return worst;
}
