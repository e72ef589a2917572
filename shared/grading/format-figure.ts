/** A figure as it reads in a grade's reason: at most `digits` significant figures, no `-0`. */
export function formatFigure(x: number, digits = 3): string {
  if (!Number.isFinite(x)) return String(x);
  const rounded = Number(x.toPrecision(digits));
  return Object.is(rounded, -0) ? '0' : String(rounded);
}

/** An operating point as it reads in a reason: "250 V / -2 V", or "250 V / 250 V / -13.5 V". */
export function formatOperatingPoint(vaVolts: number, vg2Volts: number, vg1Volts: number): string {
  const parts = [vaVolts, ...(vg2Volts > 0 ? [vg2Volts] : []), vg1Volts];
  return parts.map((v) => `${formatFigure(v, 4)} V`).join(' / ');
}
