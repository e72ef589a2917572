/**
 * Koren valve models (N. Koren, "Improved vacuum tube models for SPICE simulations",
 * Glass Audio 8(5), 1996), in the 2x form as published. Written here rather than taken from a
 * package because no maintained npm package implements them; they are a few lines of algebra.
 * Voltages in V, currents returned in mA.
 */

/** Parameters of the Koren triode model. */
export interface KorenTriodeParams {
  /** Amplification factor. */
  mu: number;
  /** Exponent. */
  ex: number;
  /** Anode current scale (inverse perveance), 1/(A·V^-EX) scaled as in the paper. */
  kg1: number;
  /** Knee shaping parameter. */
  kp: number;
  /** Knee voltage parameter, V². */
  kvb: number;
}

/** Parameters of the Koren pentode / beam-tetrode model. */
export interface KorenPentodeParams extends KorenTriodeParams {
  /** Screen current scale. */
  kg2: number;
}

/** Anode current of a triode, mA, at anode voltage va and grid voltage vg (V). */
export function korenTriodeIa(p: KorenTriodeParams, va: number, vg: number): number {
  if (va <= 0) return 0;
  const e1 = (va / p.kp) * softplus(p.kp * (1 / p.mu + vg / Math.sqrt(p.kvb + va * va)));
  if (e1 <= 0) return 0;
  return ((2 * Math.pow(e1, p.ex)) / p.kg1) * 1000;
}

/** Anode current of a pentode or beam tetrode, mA. */
export function korenPentodeIa(p: KorenPentodeParams, va: number, vg1: number, vg2: number): number {
  if (va <= 0 || vg2 <= 0) return 0;
  const e1 = (vg2 / p.kp) * softplus(p.kp * (1 / p.mu + vg1 / vg2));
  if (e1 <= 0) return 0;
  return ((2 * Math.pow(e1, p.ex)) / p.kg1) * Math.atan(va / p.kvb) * 1000;
}

/** Screen current of a pentode or beam tetrode, mA. */
export function korenPentodeIg2(p: KorenPentodeParams, vg1: number, vg2: number): number {
  const x = vg1 + vg2 / p.mu;
  if (x <= 0) return 0;
  return (Math.pow(x, p.ex) / p.kg2) * 1000;
}

/** ln(1 + e^x) without overflow for large x. */
function softplus(x: number): number {
  return x > 30 ? x : Math.log1p(Math.exp(x));
}
