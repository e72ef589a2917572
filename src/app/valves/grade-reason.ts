import type { ReferencePoint, SweepFigures } from './valves-api';

/** The newest figures of a valve that carry percentages, or null. */
export function latestFigures(trend: readonly SweepFigures[]): SweepFigures | null {
  for (let i = trend.length - 1; i >= 0; i--) {
    const f = trend[i];
    if (f.gmPercent !== null || f.iaPercent !== null) return f;
  }
  return null;
}

/**
 * Why a valve has its grade, e.g. "gm 64 % of nominal at 250 V / -2 V": the grade follows the
 * lower of the gm and Ia percentages, so that one is named.
 */
export function gradeReason(trend: readonly SweepFigures[], point: ReferencePoint): string {
  const figures = latestFigures(trend);
  if (!figures) {
    const newest = trend.at(-1);
    return newest?.refusal
      ? `No figures from the newest sweep: ${newest.refusal}.`
      : 'No sweep with figures at the reference point yet.';
  }
  const gm = figures.gmPercent;
  const ia = figures.iaPercent;
  const useGm = gm !== null && (ia === null || gm <= ia);
  const percent = useGm ? gm : ia;
  const va = figures.vaVolts ?? point.vaVolts;
  const vg1 = figures.vg1Volts ?? point.vg1Volts;
  const where = point.vg2Volts !== null ? ` (Vg2 ${point.vg2Volts} V)` : '';
  return `${useGm ? 'gm' : 'Ia'} ${Math.round(percent!)} % of nominal at ${va} V / ${vg1} V${where}`;
}
