import type { CostMatrix } from './cost-matrix';

/** Members of a pool split into groups of equal size, and the members left over. */
export interface Partition {
  /** Groups, each a list of member indices. */
  groups: number[][];
  /** Members in no group. */
  leftOver: number[];
}

/** Groups of up to this size are re-split exhaustively two at a time (462 ways for 6 + 6). */
const EXHAUSTIVE_SPLIT_LIMIT = 6;

/** Passes over all moves at most; a pass that improves nothing ends the search earlier. */
const MAX_PASSES = 500;

/**
 * Local search on a partition, deterministic: passes over every two groups in index order,
 * each time taking the best way to re-split their members into two groups (every split for
 * groups of up to six, single swaps for larger groups), then over every swap of a left-over
 * member with a group member, until a pass changes nothing. A move is taken when it lowers the
 * total group cost (sum of each group's largest pairwise cost), or keeps it and lowers the sum
 * of all pairwise costs inside groups, which lets the search cross the flat stretches a
 * largest-cost objective has. Returns a new partition; the input is not changed.
 */
export function improvePartition(costs: CostMatrix, start: Partition): Partition {
  const groups = start.groups.map((g) => [...g]);
  const leftOver = [...start.leftOver];
  if (groups.length === 0) return { groups, leftOver };
  const k = groups[0].length;
  if (groups.some((g) => g.length !== k)) throw new Error('groups must all have the same size');
  const cost = groups.map((g) => costs.groupCost(g));
  const sum = groups.map((g) => costs.groupSum(g));
  const splits = k <= EXHAUSTIVE_SPLIT_LIMIT ? splitTable(k) : null;
  const count = groups.length;
  // A pair of groups is looked at again only when one of them changed since the last look.
  let clock = 1;
  const changedAt = new Float64Array(count).fill(1);
  const lookedAt = new Float64Array(count * count);
  const touch = (...gs: number[]) => {
    clock++;
    for (const g of gs) changedAt[g] = clock;
  };
  for (let pass = 0; pass < MAX_PASSES; pass++) {
    let changed = false;
    for (let g = 0; g < count; g++) {
      for (let h = g + 1; h < count; h++) {
        const seen = lookedAt[g * count + h];
        if (seen > changedAt[g] && seen > changedAt[h]) continue;
        lookedAt[g * count + h] = ++clock;
        const moved = splits
          ? resplit(costs, groups, cost, sum, g, h, splits)
          : swapOne(costs, groups, cost, sum, g, h);
        if (moved) {
          touch(g, h);
          changed = true;
        }
      }
    }
    if (leftOver.length && swapLeftOver(costs, groups, cost, sum, leftOver, touch)) changed = true;
    // Three-way exchanges only once no two-group move is left: they cost more to look for.
    if (!changed && rotateTriples(costs, groups, cost, sum, touch)) changed = true;
    if (!changed) break;
  }
  return { groups, leftOver };
}

/** Whether (cost1, sum1) is better than (cost0, sum0): lower cost, or equal cost and lower sum. */
export function isBetter(cost1: number, sum1: number, cost0: number, sum0: number): boolean {
  return compareObjective(cost1, sum1, cost0, sum0) < 0;
}

/** -1 when (cost1, sum1) is better than (cost0, sum0), 1 when worse, 0 when equal within 1e-9. */
function compareObjective(cost1: number, sum1: number, cost0: number, sum0: number): number {
  const tol = 1e-9 * (1 + Math.abs(cost0));
  if (cost1 < cost0 - tol) return -1;
  if (cost1 > cost0 + tol) return 1;
  const sumTol = 1e-9 * (1 + Math.abs(sum0));
  return sum1 < sum0 - sumTol ? -1 : sum1 > sum0 + sumTol ? 1 : 0;
}

/** For 2k members: every split into two groups of k (first member always in the first group). */
interface SplitTable {
  /** Member pairs (a, b), a < b, as indices into the 2k members. */
  pairA: Int8Array;
  pairB: Int8Array;
  /** Per split: the pair indices inside the first group, then inside the second. */
  first: Int16Array[];
  second: Int16Array[];
  /** Per split: bit mask of the members in the first group. */
  masks: number[];
}

const splitTables = new Map<number, SplitTable>();

function splitTable(k: number): SplitTable {
  const cached = splitTables.get(k);
  if (cached) return cached;
  const n = 2 * k;
  const pa: number[] = [];
  const pb: number[] = [];
  for (let a = 0; a < n; a++) {
    for (let b = a + 1; b < n; b++) {
      pa.push(a);
      pb.push(b);
    }
  }
  const table: SplitTable = {
    pairA: Int8Array.from(pa),
    pairB: Int8Array.from(pb),
    first: [],
    second: [],
    masks: [],
  };
  for (let mask = 0; mask < 1 << n; mask++) {
    if (!(mask & 1) || popCount(mask) !== k) continue;
    const first: number[] = [];
    const second: number[] = [];
    for (let p = 0; p < pa.length; p++) {
      const inA = (mask >> pa[p]) & 1;
      const inB = (mask >> pb[p]) & 1;
      if (inA && inB) first.push(p);
      else if (!inA && !inB) second.push(p);
    }
    table.masks.push(mask);
    table.first.push(Int16Array.from(first));
    table.second.push(Int16Array.from(second));
  }
  splitTables.set(k, table);
  return table;
}

function popCount(x: number): number {
  let c = 0;
  for (; x; x &= x - 1) c++;
  return c;
}

/**
 * The best split of two groups' members; between equally good splits, the one whose group
 * holding the lowest index has the lower indices (ties broken by id, as indices follow ids).
 */
function resplit(
  costs: CostMatrix,
  groups: number[][],
  cost: number[],
  sum: number[],
  g: number,
  h: number,
  t: SplitTable,
): boolean {
  const members = [...groups[g], ...groups[h]].sort((a, b) => a - b);
  const pairCost = new Float64Array(t.pairA.length);
  for (let p = 0; p < pairCost.length; p++) {
    pairCost[p] = costs.at(members[t.pairA[p]], members[t.pairB[p]]);
  }
  const full = (1 << members.length) - 1;
  let current = 0;
  members.forEach((m, i) => {
    if (groups[g].includes(m)) current |= 1 << i;
  });
  if (!(current & 1)) current = full & ~current;
  let bestCost = cost[g] + cost[h];
  let bestSum = sum[g] + sum[h];
  let bestMask = current;
  let bestParts: [number, number, number, number] = [0, 0, 0, 0];
  for (let s = 0; s < t.masks.length; s++) {
    const [maxA, sumA] = maxAndSum(pairCost, t.first[s]);
    const [maxB, sumB] = maxAndSum(pairCost, t.second[s]);
    const order = compareObjective(maxA + maxB, sumA + sumB, bestCost, bestSum);
    if (order < 0 || (order === 0 && lowerFirst(t.masks[s], bestMask))) {
      bestCost = maxA + maxB;
      bestSum = sumA + sumB;
      bestMask = t.masks[s];
      bestParts = [maxA, sumA, maxB, sumB];
    }
  }
  if (bestMask === current) return false;
  groups[g] = members.filter((_, i) => (bestMask >> i) & 1);
  groups[h] = members.filter((_, i) => !((bestMask >> i) & 1));
  [cost[g], sum[g], cost[h], sum[h]] = bestParts;
  return true;
}

/** Whether subset a (bit mask) lists lower members than subset b of the same size. */
function lowerFirst(a: number, b: number): boolean {
  const diff = a ^ b;
  return diff !== 0 && (a & diff & -diff) !== 0;
}

function maxAndSum(pairCost: Float64Array, pairs: Int16Array): [number, number] {
  let max = 0;
  let total = 0;
  for (let i = 0; i < pairs.length; i++) {
    const c = pairCost[pairs[i]];
    if (c > max) max = c;
    total += c;
  }
  return [max, total];
}

/** Larger groups: the best single exchange of one member of g with one of h. */
function swapOne(
  costs: CostMatrix,
  groups: number[][],
  cost: number[],
  sum: number[],
  g: number,
  h: number,
): boolean {
  const a = groups[g];
  const b = groups[h];
  let bestCost = cost[g] + cost[h];
  let bestSum = sum[g] + sum[h];
  let best: [number, number] | null = null;
  for (let i = 0; i < a.length; i++) {
    for (let j = 0; j < b.length; j++) {
      const a2 = a.map((m, x) => (x === i ? b[j] : m));
      const b2 = b.map((m, x) => (x === j ? a[i] : m));
      const c = costs.groupCost(a2) + costs.groupCost(b2);
      const s = costs.groupSum(a2) + costs.groupSum(b2);
      if (isBetter(c, s, bestCost, bestSum)) {
        bestCost = c;
        bestSum = s;
        best = [i, j];
      }
    }
  }
  if (!best) return false;
  const [i, j] = best;
  [a[i], b[j]] = [b[j], a[i]];
  cost[g] = costs.groupCost(a);
  cost[h] = costs.groupCost(b);
  sum[g] = costs.groupSum(a);
  sum[h] = costs.groupSum(b);
  return true;
}

/** Every swap of a left-over member into a group, in order; true if any was taken. */
function swapLeftOver(
  costs: CostMatrix,
  groups: number[][],
  cost: number[],
  sum: number[],
  leftOver: number[],
  touch: (g: number) => void,
): boolean {
  let changed = false;
  for (let g = 0; g < groups.length; g++) {
    const group = groups[g];
    for (let t = 0; t < leftOver.length; t++) {
      for (let p = 0; p < group.length; p++) {
        const trial = group.map((m, x) => (x === p ? leftOver[t] : m));
        const c = costs.groupCost(trial);
        const s = costs.groupSum(trial);
        const order = compareObjective(c, s, cost[g], sum[g]);
        // On a tie the lower index joins the group, so ties leave the higher ids over.
        if (order < 0 || (order === 0 && leftOver[t] < group[p])) {
          [group[p], leftOver[t]] = [leftOver[t], group[p]];
          cost[g] = c;
          sum[g] = s;
          touch(g);
          changed = true;
        }
      }
    }
  }
  return changed;
}

/** Pools of up to this many groups try every three groups for exchanges; larger ones only near. */
const ALL_TRIPLES_LIMIT = 12;

/** Groups counted as near a group for three-way exchanges in large pools. */
const NEAR_GROUPS = 6;

/**
 * Three-way exchanges: one member from each of three groups moves on, round the cycle in
 * either direction. This escapes the local optima where no two groups can improve alone.
 * Tries every triple of groups in small pools, else each group with two of its nearest
 * (by mean cost between members); takes the best exchange per triple. True if any was taken.
 */
function rotateTriples(
  costs: CostMatrix,
  groups: number[][],
  cost: number[],
  sum: number[],
  touch: (...gs: number[]) => void,
): boolean {
  let changed = false;
  for (const [g, h, l] of triples(costs, groups)) {
    const [a, b, c] = [groups[g], groups[h], groups[l]];
    let bestCost = cost[g] + cost[h] + cost[l];
    let bestSum = sum[g] + sum[h] + sum[l];
    let best: number[][] | null = null;
    for (let i = 0; i < a.length; i++) {
      for (let j = 0; j < b.length; j++) {
        for (let m = 0; m < c.length; m++) {
          for (const dir of [0, 1]) {
            // dir 0: a's member goes to b, b's to c, c's to a; dir 1 the other way round.
            const inA = dir === 0 ? c[m] : b[j];
            const inB = dir === 0 ? a[i] : c[m];
            const inC = dir === 0 ? b[j] : a[i];
            const a2 = a.map((x, p) => (p === i ? inA : x));
            const b2 = b.map((x, p) => (p === j ? inB : x));
            const c2 = c.map((x, p) => (p === m ? inC : x));
            const tc = costs.groupCost(a2) + costs.groupCost(b2) + costs.groupCost(c2);
            const ts = costs.groupSum(a2) + costs.groupSum(b2) + costs.groupSum(c2);
            if (isBetter(tc, ts, bestCost, bestSum)) {
              bestCost = tc;
              bestSum = ts;
              best = [a2, b2, c2];
            }
          }
        }
      }
    }
    if (!best) continue;
    [groups[g], groups[h], groups[l]] = best;
    for (const x of [g, h, l]) {
      cost[x] = costs.groupCost(groups[x]);
      sum[x] = costs.groupSum(groups[x]);
    }
    touch(g, h, l);
    changed = true;
  }
  return changed;
}

function triples(costs: CostMatrix, groups: number[][]): [number, number, number][] {
  const count = groups.length;
  const out: [number, number, number][] = [];
  if (count < 3) return out;
  if (count <= ALL_TRIPLES_LIMIT) {
    for (let g = 0; g < count; g++) {
      for (let h = g + 1; h < count; h++) for (let l = h + 1; l < count; l++) out.push([g, h, l]);
    }
    return out;
  }
  const between = (g: number, h: number) => {
    let t = 0;
    for (const x of groups[g]) for (const y of groups[h]) t += costs.at(x, y);
    return t;
  };
  const seen = new Set<number>();
  for (let g = 0; g < count; g++) {
    const d = new Float64Array(count);
    for (let h = 0; h < count; h++) d[h] = h === g ? Number.POSITIVE_INFINITY : between(g, h);
    const near = Array.from({ length: count }, (_, h) => h)
      .sort((x, y) => d[x] - d[y] || x - y)
      .slice(0, NEAR_GROUPS);
    for (let p = 0; p < near.length; p++) {
      for (let q = p + 1; q < near.length; q++) {
        const t = [g, near[p], near[q]].sort((x, y) => x - y) as [number, number, number];
        const key = (t[0] * count + t[1]) * count + t[2];
        if (seen.has(key)) continue;
        seen.add(key);
        out.push(t);
      }
    }
  }
  return out.sort((x, y) => x[0] - y[0] || x[1] - y[1] || x[2] - y[2]);
}
