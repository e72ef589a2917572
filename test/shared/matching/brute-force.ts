import type { CostMatrix } from '../../../shared/matching/cost-matrix';

/**
 * The least total group cost over every way to split 0..n-1 into groups of k with n mod k
 * members left over (each group costs its largest pairwise cost), by plain enumeration: the
 * lowest unplaced member either starts a group with k - 1 of the later ones or, while there
 * is room, is left over. Also returns how many partitions it visited.
 */
export function bruteForceGroups(costs: CostMatrix, k: number): { best: number; count: number } {
  const n = costs.size;
  const placed = new Array<boolean>(n).fill(false);
  let best = Number.POSITIVE_INFINITY;
  let count = 0;
  const visit = (spare: number, total: number) => {
    const first = placed.indexOf(false);
    if (first < 0) {
      count++;
      if (total < best) best = total;
      return;
    }
    placed[first] = true;
    if (spare > 0) visit(spare - 1, total);
    const rest: number[] = [];
    for (let j = first + 1; j < n; j++) if (!placed[j]) rest.push(j);
    const pick = (from: number, group: number[]) => {
      if (group.length === k) {
        for (const m of group) placed[m] = true;
        visit(spare, total + costs.groupCost(group));
        for (const m of group) if (m !== first) placed[m] = false;
        return;
      }
      for (let r = from; r < rest.length; r++) pick(r + 1, [...group, rest[r]]);
    };
    pick(0, [first]);
    placed[first] = false;
  };
  visit(n % k, 0);
  return { best, count };
}
