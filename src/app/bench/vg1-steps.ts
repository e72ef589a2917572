/**
 * Grid-1 voltages from start towards stop in steps of |step|, V; stop is included when it falls
 * on a step. At most `maxCount + 1` values are generated, so a caller can tell "too many"
 * without building a huge list. Empty when an input is not a finite number or step is not > 0.
 */
export function vg1Steps(
  startVolts: number | null,
  stopVolts: number | null,
  stepVolts: number | null,
  maxCount: number,
): number[] {
  if (startVolts === null || stopVolts === null || stepVolts === null) return [];
  if (![startVolts, stopVolts, stepVolts].every(Number.isFinite) || stepVolts <= 0) return [];
  const direction = stopVolts >= startVolts ? 1 : -1;
  const steps = Math.floor(Math.abs(stopVolts - startVolts) / stepVolts + 1e-9);
  const out: number[] = [];
  for (let i = 0; i <= Math.min(steps, maxCount); i++) {
    out.push(Math.round((startVolts + direction * i * stepVolts) * 1000) / 1000);
  }
  return out;
}

/** Start, stop and step that regenerate an evenly spaced list of grid voltages. */
export function vg1Range(volts: readonly number[]): {
  startVolts: number;
  stopVolts: number;
  stepVolts: number;
} {
  const startVolts = volts[0] ?? 0;
  const stopVolts = volts.at(-1) ?? startVolts;
  const stepVolts = volts.length > 1 ? Math.abs(volts[1] - volts[0]) : 1;
  return { startVolts, stopVolts, stepVolts };
}
