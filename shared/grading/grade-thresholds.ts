/** Grades a valve can get against its type's nominal figures, best first (Emberline's names). */
export const VALVE_GRADES = ['strong', 'fair', 'weak'] as const;

/** A valve's grade against nominal. */
export type ValveGrade = (typeof VALVE_GRADES)[number];

/**
 * Where the grades begin, as percentages of the type's nominal figures at its reference
 * operating point (the first typical operating point of the type). A valve is judged by the
 * lower of its gm and Ia percentages there, so a valve weak in either is weak.
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
