/**
 * Cubic Hermite basis on the unit interval: value = h00·y0 + h10·Δ·d0 + h01·y1 + h11·Δ·d1 for an
 * interval of width Δ with end values y and end slopes d.
 */
export function hermiteBasis(t: number): [number, number, number, number] {
  const t2 = t * t;
  const t3 = t2 * t;
  return [2 * t3 - 3 * t2 + 1, t3 - 2 * t2 + t, -2 * t3 + 3 * t2, t3 - t2];
}
