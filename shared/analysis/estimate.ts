/**
 * A derived quantity with its standard uncertainty. The uncertainty combines, in quadrature, the
 * residual scatter of the local fits propagated to the quantity and the disagreement between
 * estimates of different order (a measure of truncation error).
 */
export interface Estimate {
  /** The value, in the unit named by the field that holds it. */
  value: number;
  /** Standard uncertainty (one sigma), same unit as the value. */
  uncertainty: number;
}

/** Builds an estimate; a negative or NaN uncertainty is taken as unknown (Infinity). */
export function estimate(value: number, uncertainty: number): Estimate {
  return { value, uncertainty: uncertainty >= 0 ? uncertainty : Number.POSITIVE_INFINITY };
}
