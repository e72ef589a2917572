const work = new Float64Array(6 * 12);

/**
 * Inverts the n×n Hankel matrix A[i][j] = s[i + j] (n <= 6), the normal matrix of a polynomial
 * least-squares fit, into out (row-major with the given row stride) by Gauss-Jordan elimination
 * with partial pivoting. Returns false when it is singular to working precision.
 * Allocation-free, because it runs for every knot of every curve.
 */
export function invertHankel(
  s: ArrayLike<number>,
  n: number,
  out: Float64Array,
  stride = 4,
): boolean {
  const m = work;
  const w = 12;
  m.fill(0);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) m[i * w + j] = s[i + j];
    m[i * w + 6 + i] = 1;
  }
  const scale = Math.abs(s[0]) + Math.abs(s[2 * n - 2]);
  for (let col = 0; col < n; col++) {
    let pivot = col;
    for (let r = col + 1; r < n; r++) {
      if (Math.abs(m[r * w + col]) > Math.abs(m[pivot * w + col])) pivot = r;
    }
    if (!(Math.abs(m[pivot * w + col]) > scale * 1e-15)) return false;
    // Only columns 0..n-1 (the matrix) and 6..6+n-1 (the growing inverse) are in use.
    if (pivot !== col) {
      for (let c = 0; c < 6 + n; c = c === n - 1 ? 6 : c + 1) {
        const tmp = m[col * w + c];
        m[col * w + c] = m[pivot * w + c];
        m[pivot * w + c] = tmp;
      }
    }
    const p = 1 / m[col * w + col];
    for (let c = 0; c < 6 + n; c = c === n - 1 ? 6 : c + 1) m[col * w + c] *= p;
    for (let r = 0; r < n; r++) {
      if (r === col) continue;
      const f = m[r * w + col];
      if (f === 0) continue;
      for (let c = 0; c < 6 + n; c = c === n - 1 ? 6 : c + 1) m[r * w + c] -= f * m[col * w + c];
    }
  }
  out.fill(0);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) out[i * stride + j] = m[i * w + 6 + j];
  return true;
}
