/** Grades a valve can get against its type's nominal figures, best first (Emberline's names). */
export const VALVE_GRADES = ['strong', 'fair', 'weak'] as const;

/** A valve's grade against nominal. */
export type ValveGrade = (typeof VALVE_GRADES)[number];

/**
 * Where the grades begin, as percentages of the type's nominal figures at its reference
 * operating point (the first typical operating point of the type); which figure is judged is
 * gradedPercent's rule, the same for sweeps and quick tests.
 */
export interface GradeThresholds {
  /** Least percentage of nominal that grades 'strong', %. */
  strongMinPercent: number;
  /** Least percentage of nominal that grades 'fair'; below it the valve grades 'weak', %. */
  fairMinPercent: number;
}

/**
 * Defaults from common practice, not from a single source: a valve whose gm or emission is
 * below about 60-70 % of nominal is usually replaced, so 'weak' starts below 65 %; 80 % and up
 * is comfortably inside the spread of new valves (data-sheet figures are averages, new valves
 * spread roughly ±20-30 % around them).
 */
export const DEFAULT_GRADE_THRESHOLDS: GradeThresholds = {
  strongMinPercent: 80,
  fairMinPercent: 65,
};

/** The grade of a percentage of nominal, %. */
export function gradeForPercent(percent: number, thresholds: GradeThresholds): ValveGrade {
  if (percent >= thresholds.strongMinPercent) return 'strong';
  if (percent >= thresholds.fairMinPercent) return 'fair';
  return 'weak';
}

/**
 * The one figure a valve is graded on, %: gm as a percentage of the data sheet's at the
 * reference point, or Ia's percentage where gm is unknown (no published gm, or none measured).
 * Ia is shown beside it but does not grade: the data sheets and the published models disagree
 * on Ia at the same conditions by up to 20 % (12AX7 at 250 V / -2 V: 1.2 mA against 0.95 mA),
 * while they agree on gm, and gm is what falls as a cathode wears (common practice: grading by
 * mutual conductance).
 */
export function gradedPercent(gmPercent: number | null, iaPercent: number | null): number | null {
  return gmPercent ?? iaPercent;
}

/** Which figure gradedPercent took: 'gm', 'Ia', or null when neither is known. */
export function gradedFigure(
  gmPercent: number | null,
  iaPercent: number | null,
): 'gm' | 'Ia' | null {
  if (gmPercent !== null) return 'gm';
  return iaPercent !== null ? 'Ia' : null;
}
