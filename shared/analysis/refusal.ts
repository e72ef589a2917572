/** A computation that declined to answer, with a reason a user can act on. */
export interface Refusal {
  /** Always false: tells a refusal apart from a result. */
  ok: false;
  /** Why, with the figures, e.g. "Va 320 V is above the measured range of the -2 V curve". */
  reason: string;
}

/** Builds a refusal. */
export function refuse(reason: string): Refusal {
  return { ok: false, reason };
}

/** A number as it reads in a reason: four significant figures, no trailing zeros. */
export function formatNumber(x: number): string {
  if (!Number.isFinite(x)) return String(x);
  const rounded = Number(x.toPrecision(4));
  return Object.is(rounded, -0) ? '0' : String(rounded);
}

/** A voltage span as it reads in a reason, e.g. "0-300 V" or "-10 to -2 V". */
export function formatSpanVolts(lo: number, hi: number): string {
  const sep = lo < 0 || hi < 0 ? ' to ' : '-';
  return `${formatNumber(lo)}${sep}${formatNumber(hi)} V`;
}
