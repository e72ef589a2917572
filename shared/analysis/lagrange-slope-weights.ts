/**
 * Weights w such that the derivative at x of the polynomial through (nodes, y) is Σ w·y.
 * The returned array is reused by the next call.
 */
export function lagrangeSlopeWeights(nodes: ArrayLike<number>, x: number): Float64Array {
  const n = nodes.length;
  const w = n <= out.length ? out : new Float64Array(n);
  for (let j = 0; j < n; j++) {
    let sum = 0;
    for (let m = 0; m < n; m++) {
      if (m === j) continue;
      let prod = 1 / (nodes[j] - nodes[m]);
      for (let l = 0; l < n; l++) {
        if (l !== j && l !== m) prod *= (x - nodes[l]) / (nodes[j] - nodes[l]);
      }
      sum += prod;
    }
    w[j] = sum;
  }
  return w;
}

const out = new Float64Array(8);
