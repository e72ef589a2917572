import { gradeForPercent, type ValveGrade } from './grade-thresholds';
import { formatFigure, formatOperatingPoint } from './format-figure';
import type { QuickTestReference } from './quick-test-plan';
import type { PartOutcome, PartResult } from './quick-test-results';
import { pairTitle } from './quick-test-results';
import type { QuickTestThresholds } from './quick-test-thresholds';

/** Faults that fail a valve whatever its gm, worst first. */
export const HARD_FAILS = ['open-heater', 'short', 'leaky', 'gassy', 'worn-cathode'] as const;

/** A hard fail. */
export type HardFail = (typeof HARD_FAILS)[number];

/**
 * The grade of a quick test: a hard fail when one was found, else the quality grade of the type
 * library (strong, fair, weak by % of nominal), or 'incomplete' when nothing graded was read.
 */
export type QuickTestGradeName = HardFail | ValveGrade | 'incomplete';

/** One thing a grade took into account. */
export interface GradeFinding {
  /** What was judged. */
  criterion: 'heater' | 'short' | 'leakage' | 'gas' | 'cathode' | 'gm' | 'emission' | 'ia';
  /** A hard fail, a quality grade, 'pass' for a check passed, or 'info' for a figure shown. */
  verdict: HardFail | ValveGrade | 'pass' | 'info';
  /** The finding in words, with its figures. */
  message: string;
}

/** A quick test's grade and why. */
export interface QuickTestGrade {
  grade: QuickTestGradeName;
  /** The deciding reason, e.g. "gm 64 % of nominal (1020 of 1600 uS) at 250 V / -2 V". */
  reason: string;
  /** Every finding: hard fails first (worst first), then the graded figures, then the rest. */
  findings: GradeFinding[];
  /**
   * The lowest graded figure (gm or emission) as % of nominal, also under a hard fail; null
   * when neither was read. Absent on grades stored before it was kept.
   */
  percent?: number | null;
}

const PERCENT = (x: number) => `${formatFigure(x, 3)} %`;

/**
 * Grades a quick test from its parts (pure):
 * 1. Hard fails, worst first: an open heater (tracer error E30); a short (a pair at or above
 *    shortMinMicroamps or over range, or the tracer's short error E31); leakage above its limit
 *    (heater-cathode, or between other electrodes); reverse grid current above gasMaxMicroamps
 *    (gas); gm falling more than reducedHeaterMaxDropPercent at 10 % less heater (worn cathode).
 * 2. Otherwise the quality grade of the lower of gm (% of the data sheet's, at the type's
 *    operating point) and emission (% of the model's sound valve), by the thresholds' strong
 *    and fair limits. Ia against the data sheet is shown but not graded: the published models
 *    and the data sheets disagree on it by up to 20 % (12AX7 at 250 V / -2 V: 0.95 against
 *    1.2 mA), while gm agrees closely.
 * 3. 'incomplete' when neither gm nor emission was read and no hard fail was found.
 */
export function gradeQuickTest(
  reference: QuickTestReference,
  parts: readonly PartOutcome[],
  thresholds: QuickTestThresholds,
): QuickTestGrade {
  const fails: GradeFinding[] = [];
  const graded: (GradeFinding & { percent: number })[] = [];
  const rest: GradeFinding[] = [];
  const fail = (verdict: HardFail, criterion: GradeFinding['criterion'], message: string) => {
    // One fault seen by several parts (a short stops each of them) is one finding.
    if (!fails.some((f) => f.message === message)) fails.push({ criterion, verdict, message });
  };
  const at = formatOperatingPoint(reference.vaVolts, reference.vg2Volts, reference.vg1Volts);

  for (const p of parts) {
    if (p.errorCode === 'E30') {
      fail(
        'open-heater',
        'heater',
        `no heater current at ${formatFigure(reference.heaterVolts)} V (tracer error E30): the ` +
          'heater is open',
      );
    }
    if (p.errorCode === 'E31') {
      fail(
        'short',
        'short',
        'the tracer found a short between electrodes at its low-voltage check (error E31)',
      );
    }
    if (p.status === 'done' && p.result) judge(p.result);
  }

  function judge(r: PartResult): void {
    switch (r.part) {
      case 'leakage': {
        let clean = true;
        for (const x of r.pairs) {
          const what = `${pairTitle(x.pair)}`;
          if (x.overRange || x.microamps >= thresholds.shortMinMicroamps) {
            const reading = x.overRange
              ? `beyond the meter's ${formatFigure(x.microamps)} uA`
              : `${formatFigure(x.microamps)} uA`;
            fail(
              'short',
              'short',
              `${what} short: ${reading} at ${formatFigure(x.volts)} V (a short is ` +
                `${formatFigure(thresholds.shortMinMicroamps)} uA or more)`,
            );
            clean = false;
            continue;
          }
          const limit =
            x.pair === 'heater-cathode'
              ? thresholds.leakageMaxMicroamps
              : thresholds.electrodeLeakageMaxMicroamps;
          if (x.microamps > limit) {
            fail(
              'leaky',
              'leakage',
              `${what} leakage ${formatFigure(x.microamps)} uA at ${formatFigure(x.volts)} V ` +
                `(limit ${formatFigure(limit)} uA)`,
            );
            clean = false;
          }
        }
        if (clean) {
          const worst = Math.max(...r.pairs.map((x) => x.microamps));
          rest.push({
            criterion: 'leakage',
            verdict: 'pass',
            message: `no short or leakage: at most ${formatFigure(worst)} uA on ${r.pairs.length} pairs`,
          });
        }
        return;
      }
      case 'gm':
        graded.push({
          criterion: 'gm',
          verdict: gradeForPercent(r.gmPercent, thresholds),
          percent: r.gmPercent,
          message:
            `gm ${PERCENT(r.gmPercent)} of nominal (${formatFigure(r.measurement.gmMicrosiemens)} ` +
            `of ${formatFigure(r.nominalGmMicrosiemens)} uS) at ${at}`,
        });
        rest.push({
          criterion: 'ia',
          verdict: 'info',
          message:
            `Ia ${formatFigure(r.measurement.iaMilliamps)} mA at ${at}, ${PERCENT(r.iaPercent)} ` +
            `of the data sheet's ${formatFigure(r.nominalIaMilliamps)} mA (not graded)`,
        });
        return;
      case 'grid-current': {
        const reverse = -r.ig1Microamps;
        const text =
          `reverse grid current ${formatFigure(reverse)} uA at ${at} through ` +
          `${formatFigure(r.gridKiloohms)} kOhm`;
        if (reverse > thresholds.gasMaxMicroamps) {
          fail(
            'gassy',
            'gas',
            `${text} (limit ${formatFigure(thresholds.gasMaxMicroamps)} uA): gas`,
          );
        } else rest.push({ criterion: 'gas', verdict: 'pass', message: text });
        return;
      }
      case 'emission':
        graded.push({
          criterion: 'emission',
          verdict: gradeForPercent(r.percent, thresholds),
          percent: r.percent,
          message:
            `emission ${PERCENT(r.percent)} of a sound valve's (${formatFigure(r.milliamps)} of ` +
            `${formatFigure(r.expectedMilliamps)} mA) at ${formatFigure(r.vaVolts)} V, grids ` +
            'strapped to the anode',
        });
        return;
      case 'reduced-heater': {
        const text =
          `gm ${r.dropPercent >= 0 ? 'falls' : 'rises'} ${PERCENT(Math.abs(r.dropPercent))} ` +
          `at ${formatFigure(r.reduced.heaterVolts, 4)} V heater (10 % below ` +
          `${formatFigure(r.nominal.heaterVolts, 4)} V)`;
        if (r.dropPercent > thresholds.reducedHeaterMaxDropPercent) {
          fail(
            'worn-cathode',
            'cathode',
            `${text}; a sound cathode's hardly moves (limit ` +
              `${formatFigure(thresholds.reducedHeaterMaxDropPercent)} %): worn cathode`,
          );
        } else rest.push({ criterion: 'cathode', verdict: 'pass', message: text });
        return;
      }
    }
  }

  fails.sort((a, b) => rank(a.verdict) - rank(b.verdict));
  graded.sort((a, b) => a.percent - b.percent);
  const findings = [...fails, ...graded.map(({ percent: _p, ...f }) => f), ...rest];
  const percent = graded.length > 0 ? graded[0].percent : null;
  if (fails.length > 0) {
    return { grade: fails[0].verdict as HardFail, reason: fails[0].message, findings, percent };
  }
  if (graded.length > 0) {
    return { grade: graded[0].verdict as ValveGrade, reason: graded[0].message, findings, percent };
  }
  const failed = parts.filter((p) => p.status === 'failed' || p.status === 'skipped');
  const why = failed.length
    ? failed.map((p) => `${p.part}: ${p.message ?? p.status}`).join('; ')
    : 'neither gm nor emission was measured';
  return {
    grade: 'incomplete',
    reason: `no gm or emission reading (${why})`,
    findings,
    percent: null,
  };
}

function rank(verdict: GradeFinding['verdict']): number {
  return HARD_FAILS.indexOf(verdict as HardFail);
}
