/** A figure to `digits` significant digits without trailing zeros; '–' when there is none. */
export function reportFigure(x: number | null | undefined, digits = 4): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '–';
  if (x === 0) return '0';
  // Whole numbers keep every digit: 11 040 µS stays 11040, not 1.104e4.
  const rounded = Math.abs(x) >= 10 ** digits ? Math.round(x) : Number(x.toPrecision(digits));
  return String(rounded);
}

/** A percentage to one decimal, or '–'. */
export function reportPercent(x: number | null | undefined): string {
  return x === null || x === undefined || !Number.isFinite(x) ? '–' : x.toFixed(1);
}
