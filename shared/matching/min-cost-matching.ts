import maxWeightMatching from 'edmonds-blossom';

/** Pools of up to this many units are matched on every possible pair: the exact optimum. */
export const EXACT_MATCHING_LIMIT = 200;

/** In larger pools each unit is offered only its this-many nearest units by cost. */
export const SPARSE_NEIGHBOURS = 10;

/** How the matching is run. */
export interface MatchingOptions {
  /** Largest pool matched on the complete graph (default EXACT_MATCHING_LIMIT). */
  exactLimit?: number;
  /** Neighbours per unit in larger pools (default SPARSE_NEIGHBOURS). */
  neighbours?: number;
}

// Weights are handed over as integers: the blossom algorithm compares slacks with zero, and
// integer arithmetic keeps those comparisons exact. 2^36 steps over the cost range resolve
// costs far below any meaningful difference while every sum stays exact in a double.
const WEIGHT_STEPS = 2 ** 36;

/**
 * Pairs units 0..size-1 at the least total cost, with as many pairs as possible (an odd pool
 * leaves exactly one unit over): minimum-cost maximum-cardinality matching by Edmonds' blossom
 * algorithm, through the edmonds-blossom package, which maximises weight, so each cost c becomes
 * the weight (largest cost - c). Exact up to exactLimit units. Above it the graph keeps each
 * unit's nearest neighbours, the usual sparsification for large pools (the optimum almost always
 * pairs near neighbours); units it leaves unpaired are matched among themselves. Returns
 * mate[i], or -1 for a unit left over.
 */
export function minCostMatching(
  size: number,
  cost: (i: number, j: number) => number,
  options: MatchingOptions = {},
): Int32Array {
  const mate = new Int32Array(size).fill(-1);
  const units = Array.from({ length: size }, (_, i) => i);
  matchAmong(
    units,
    cost,
    mate,
    options.exactLimit ?? EXACT_MATCHING_LIMIT,
    options.neighbours ?? SPARSE_NEIGHBOURS,
  );
  return mate;
}

function matchAmong(
  units: readonly number[],
  cost: (i: number, j: number) => number,
  mate: Int32Array,
  exactLimit: number,
  neighbours: number,
): void {
  const m = units.length;
  if (m < 2) return;
  const pairs = m <= exactLimit ? allPairs(m) : nearestPairs(units, cost, neighbours);
  const costs = pairs.map(([a, b]) => cost(units[a], units[b]));
  let top = 0;
  for (const c of costs) if (c > top) top = c;
  const scale = top > 0 ? WEIGHT_STEPS / top : 0;
  const edges = pairs.map(([a, b], k) => [a, b, Math.round((top - costs[k]) * scale) + 1] as const);
  const local = runBlossom(edges, m);
  const unpaired: number[] = [];
  for (let a = 0; a < m; a++) {
    if (local[a] >= 0) mate[units[a]] = units[local[a]];
    else unpaired.push(units[a]);
  }
  // Only the sparse graph can leave more than the one odd unit over; every round pairs at least
  // one more, so this ends.
  if (unpaired.length > 1) matchAmong(unpaired, cost, mate, exactLimit, neighbours);
}

function allPairs(m: number): [number, number][] {
  const out: [number, number][] = [];
  for (let a = 0; a < m; a++) for (let b = a + 1; b < m; b++) out.push([a, b]);
  return out;
}

/** The union of each unit's nearest neighbours (ties by index), as local index pairs a < b. */
function nearestPairs(
  units: readonly number[],
  cost: (i: number, j: number) => number,
  neighbours: number,
): [number, number][] {
  const m = units.length;
  const k = Math.min(neighbours, m - 1);
  const seen = new Set<number>();
  const row = new Float64Array(m);
  const order = Array.from({ length: m }, (_, i) => i);
  for (let a = 0; a < m; a++) {
    for (let b = 0; b < m; b++)
      row[b] = b === a ? Number.POSITIVE_INFINITY : cost(units[a], units[b]);
    order.sort((x, y) => row[x] - row[y] || x - y);
    for (let r = 0; r < k; r++) {
      const b = order[r];
      seen.add(a < b ? a * m + b : b * m + a);
    }
  }
  return [...seen].sort((x, y) => x - y).map((key) => [Math.floor(key / m), key % m]);
}

function runBlossom(edges: readonly (readonly [number, number, number])[], m: number): Int32Array {
  allowSloppyAssignments();
  const result = maxWeightMatching(edges, true);
  const mate = new Int32Array(m).fill(-1);
  for (let a = 0; a < result.length; a++) mate[a] = result[a];
  for (let a = 0; a < m; a++) {
    if (mate[a] >= 0 && mate[mate[a]] !== a) throw new Error('blossom matching is not symmetric');
  }
  return mate;
}

/**
 * edmonds-blossom 1.0.0 assigns three undeclared variables (b and path in addBlossom, v in
 * expandBlossom), which throws a ReferenceError in strict code, as every ES-module bundle is
 * (the browser build of the app), as soon as a blossom forms. Known upstream:
 * https://github.com/mattkrick/EdmondsBlossom/issues/1 and /issues/4. Declaring them on the
 * global object lets those assignments land there, as they do in Node's sloppy CommonJS.
 * Remove once the package is patched or replaced.
 */
function allowSloppyAssignments(): void {
  const g = globalThis as Record<string, unknown>;
  for (const name of ['b', 'path', 'v']) if (!(name in g)) g[name] = undefined;
}
