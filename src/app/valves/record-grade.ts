import { gradeReason, latestFigures } from './grade-reason';
import type { TrendSource } from './trend-points';
import type { QuickTestSummary, ValveDetail } from './valves-api';

/** Why a valve has the grade the hub gave it, and what that grade was taken from. */
export interface RecordGrade {
  reason: string;
  /** The sweep or quick test the grade comes from, or null when there is none. */
  from: { source: TrendSource; id: number; at: string } | null;
}

/** A quick test that ended with a grade from its readings (a hard fail or a quality grade). */
function graded(t: QuickTestSummary): boolean {
  return t.status === 'complete' && t.grade !== null && t.grade !== 'incomplete';
}

/**
 * The reason behind a record's grade (the hub grades by the valve's newest sweep with figures
 * or completed quick test): the quick test's own reason, or the sweep's graded figure and the
 * reference point; without a grade, why there is none.
 */
export function recordGrade(valve: ValveDetail): RecordGrade {
  if (valve.gradeSource === 'quick-test') {
    const test =
      valve.quickTests.find((t) => graded(t) && t.at === valve.gradedAt) ??
      valve.quickTests.find(graded);
    if (test) {
      return {
        reason: test.reason ?? 'graded by the quick test',
        from: { source: 'quick-test', id: test.id, at: test.at },
      };
    }
  }
  const figures = latestFigures(valve.trend);
  if (valve.gradeSource === 'sweep' && figures) {
    const carried =
      figures.extendedVolts > 0
        ? `; a neighbouring curve stopped at the sweep's limit and was carried ` +
          `${Math.round(figures.extendedVolts)} V on to the point`
        : '';
    return {
      reason: gradeReason(valve.trend, valve.referencePoint, valve.percentOfNominal) + carried,
      from: { source: 'sweep', id: figures.sweepId, at: figures.at },
    };
  }
  const newestTest = valve.quickTests[0];
  let reason: string;
  if (valve.trend.length) reason = gradeReason(valve.trend, valve.referencePoint);
  else if (newestTest) {
    const why = newestTest.reason ?? newestTest.status;
    reason = `The newest quick test gave no grade: ${why}.`;
  } else reason = 'Not measured yet: no sweep or quick test with figures at the reference point.';
  return { reason, from: null };
}
