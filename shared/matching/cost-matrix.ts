/**
 * Symmetric costs between the members of a pool (indices 0..size-1), with the group cost the
 * grouping minimises: the largest pairwise cost inside a group, so a group is as good as its
 * worst-matched pair. The sum of pairwise costs serves as the tie-breaker in the local search.
 */
export class CostMatrix {
  private constructor(
    /** Number of members. */
    readonly size: number,
    private readonly values: Float64Array,
  ) {}

  /** Builds the matrix from a cost function called once per unordered pair (i < j). */
  static build(size: number, cost: (i: number, j: number) => number): CostMatrix {
    const values = new Float64Array(size * size);
    for (let i = 0; i < size; i++) {
      for (let j = i + 1; j < size; j++) {
        const c = cost(i, j);
        if (!Number.isFinite(c) || c < 0) {
          throw new Error(`cost between ${i} and ${j} must be finite and not negative; got ${c}`);
        }
        values[i * size + j] = c;
        values[j * size + i] = c;
      }
    }
    return new CostMatrix(size, values);
  }

  /** Cost between members i and j (0 on the diagonal). */
  at(i: number, j: number): number {
    return this.values[i * this.size + j];
  }

  /** Cost of a group: its largest pairwise cost (0 for fewer than two members). */
  groupCost(members: readonly number[]): number {
    let worst = 0;
    for (let a = 0; a < members.length; a++) {
      const row = members[a] * this.size;
      for (let b = a + 1; b < members.length; b++) {
        const c = this.values[row + members[b]];
        if (c > worst) worst = c;
      }
    }
    return worst;
  }

  /** Sum of the pairwise costs inside a group. */
  groupSum(members: readonly number[]): number {
    let sum = 0;
    for (let a = 0; a < members.length; a++) {
      const row = members[a] * this.size;
      for (let b = a + 1; b < members.length; b++) sum += this.values[row + members[b]];
    }
    return sum;
  }

  /** Total cost of a partition: the sum of its group costs (left-over members cost nothing). */
  partitionCost(groups: readonly (readonly number[])[]): number {
    let total = 0;
    for (const g of groups) total += this.groupCost(g);
    return total;
  }
}
