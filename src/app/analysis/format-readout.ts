import type { Estimate } from '../../../shared/analysis/estimate';

/** A number with its unit, ready for a readout: the number in mono, the unit beside it. */
export interface ReadoutText {
  /** The figures, e.g. "1.62 ± 0.04". */
  text: string;
  /** The unit, e.g. "mA/V" ('' for unitless figures). */
  unit: string;
}

/** Decimals that show an uncertainty with two significant figures (0 to 6). */
export function decimalsForUncertainty(uncertainty: number): number {
  if (!(uncertainty > 0) || !Number.isFinite(uncertainty)) return 3;
  return Math.min(6, Math.max(0, 1 - Math.floor(Math.log10(uncertainty))));
}

/** A number with a fixed count of decimals; '—' when not finite, never "-0.0". */
export function formatFixed(value: number, decimals: number): string {
  if (Number.isNaN(value)) return '—';
  if (!Number.isFinite(value)) return value > 0 ? '∞' : '-∞';
  const text = value.toFixed(decimals);
  return /^-0(\.0*)?$/.test(text) ? text.slice(1) : text;
}

/**
 * An estimate as "value ± uncertainty", both scaled by `scale` (e.g. 1e-3 for µS to mA/V), the
 * value rounded to the uncertainty's second significant figure but to no more than five
 * significant figures ("± <0.0001" where the uncertainty is below half of that last place). An unknown
 * uncertainty shows "± ?", a zero one the value alone, each with `fallbackDecimals`. A no-break
 * space keeps "±" with its number when a narrow tile wraps the line.
 */
export function formatEstimate(estimate: Estimate, scale = 1, fallbackDecimals = 3): string {
  const value = estimate.value * scale;
  const uncertainty = Math.abs(estimate.uncertainty * scale);
  if (!Number.isFinite(value)) return formatFixed(value, 0);
  if (!Number.isFinite(uncertainty)) return `${formatFixed(value, fallbackDecimals)} ±\u00a0?`;
  if (!(uncertainty > 0)) return formatFixed(value, fallbackDecimals);
  const wanted = decimalsForUncertainty(uncertainty);
  const magnitude = value === 0 ? 0 : Math.floor(Math.log10(Math.abs(value)));
  const decimals = Math.min(wanted, Math.max(0, 4 - magnitude));
  const step = 10 ** -decimals;
  const shown =
    uncertainty < step / 2 ? `<${formatFixed(step, decimals)}` : formatFixed(uncertainty, decimals);
  return `${formatFixed(value, decimals)} ±\u00a0${shown}`;
}

/** Power as it reads at the bench: mW below 1 W, W above. */
export function formatPower(watts: number): ReadoutText {
  if (Math.abs(watts) < 1) return { text: formatFixed(1000 * watts, 1), unit: 'mW' };
  return { text: formatFixed(watts, 2), unit: 'W' };
}

/** A refusal reason as a sentence: first letter capitalised, full stop at the end. */
export function reasonSentence(reason: string): string {
  const text = reason.trim();
  if (!text) return '';
  const first = text[0].toUpperCase() + text.slice(1);
  return /[.!?]$/.test(first) ? first : `${first}.`;
}

/** Parses a number typed into a field (accepting a decimal comma); null if it is not one. */
export function parseTypedNumber(text: string): number | null {
  const cleaned = text
    .trim()
    .replace(',', '.')
    .replace(/^\u2212/, '-');
  if (!/^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i.test(cleaned)) return null;
  const value = Number(cleaned);
  return Number.isFinite(value) ? value : null;
}
