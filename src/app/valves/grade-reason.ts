import type { ReferencePoint, SweepFigures } from './valves-api';

/** The newest figures of a valve that carry percentages, or null. */
export function latestFigures(trend: readonly SweepFigures[]): SweepFigures | null {
  for (let i = trend.length - 1; i >= 0; i--) {
    const f = trend[i];
    if (f.gmPercent !== null || f.iaPercent !== null) return f;
  }
  return null;
}

/** Percentages closer than this are the same figure, % (the hub rounds to four digits). */
const SAME_PERCENT = 0.05;

/**
 * Which figure a grade of `percent` was taken from: the one whose percentage it is, so the
 * reason always names the figure behind the chip; gm when it cannot tell (the hub grades by gm
 * where gm is known).
 */
function gradedFigure(figures: SweepFigures, percent: number | null): 'gm' | 'Ia' {
  const gm = figures.gmPercent;
  const ia = figures.iaPercent;
  if (gm === null) return 'Ia';
  if (ia === null || percent === null) return 'gm';
  if (Math.abs(gm - percent) < SAME_PERCENT) return 'gm';
  return Math.abs(ia - percent) < SAME_PERCENT ? 'Ia' : 'gm';
}

/**
 * Why a valve has its grade, e.g. "gm 64 % of nominal at 250 V / -2 V", naming the figure whose
 * percentage (`percent`, the grade's) decided it.
 */
export function gradeReason(
  trend: readonly SweepFigures[],
  point: ReferencePoint,
  percent: number | null = null,
): string {
  const figures = latestFigures(trend);
  if (!figures) {
    const newest = trend.at(-1);
    return newest?.refusal
      ? `No figures from the newest sweep: ${newest.refusal}.`
      : 'No sweep with figures at the reference point yet.';
  }
  const useGm = gradedFigure(figures, percent) === 'gm';
  const shown = useGm ? figures.gmPercent : figures.iaPercent;
  const va = figures.vaVolts ?? point.vaVolts;
  const vg1 = figures.vg1Volts ?? point.vg1Volts;
  const where = point.vg2Volts !== null ? ` (Vg2 ${point.vg2Volts} V)` : '';
  return `${useGm ? 'gm' : 'Ia'} ${Math.round(shown!)} % of nominal at ${va} V / ${vg1} V${where}`;
}
