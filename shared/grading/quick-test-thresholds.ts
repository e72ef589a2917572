import { DEFAULT_GRADE_THRESHOLDS, type GradeThresholds } from './grade-thresholds';

/**
 * Everything a quick test is judged by: the grade thresholds of the type library's grading
 * (GradeThresholds: % of nominal gm or expected emission) plus the limits of the hard fails.
 * Currents in uA, changes in %.
 */
export interface QuickTestThresholds extends GradeThresholds {
  /** Largest fall of gm at a 10 % lower heater voltage that a sound cathode shows, %. */
  reducedHeaterMaxDropPercent: number;
  /** Largest reverse grid-1 current at the operating point before a valve counts as gassy, uA. */
  gasMaxMicroamps: number;
  /** Largest heater-cathode leakage at the test voltage, uA. */
  leakageMaxMicroamps: number;
  /** Largest leakage between any other two electrodes at the test voltage, uA. */
  electrodeLeakageMaxMicroamps: number;
  /** Current from which a pair counts as shorted rather than leaky, uA. */
  shortMinMicroamps: number;
}

/**
 * Defaults a workshop starts from.
 * - strong/fair: the type library's defaults (GradeThresholds): common practice, below about
 *   60-70 % of nominal gm or emission a valve is usually replaced.
 * - reducedHeaterMaxDropPercent 10: common practice says a sound cathode's gm hardly moves when
 *   the heater drops 10 % and a worn one falls sharply; 10 % is our line between the two.
 * - gasMaxMicroamps 0.2: our choice, in line with common practice for small-signal valves (a
 *   reverse grid current of a few tenths of a uA means gas); power valves may warrant more.
 * - leakageMaxMicroamps 10, electrodeLeakageMaxMicroamps 2: our choice (10 MOhm heater-cathode,
 *   50 MOhm between electrodes, at 100 V); a sound valve reads tens of nA.
 * - shortMinMicroamps 100: our choice: under 1 MOhm at 100 V is a short, not a leak.
 */
export const DEFAULT_QUICK_TEST_THRESHOLDS: QuickTestThresholds = {
  ...DEFAULT_GRADE_THRESHOLDS,
  reducedHeaterMaxDropPercent: 10,
  gasMaxMicroamps: 0.2,
  leakageMaxMicroamps: 10,
  electrodeLeakageMaxMicroamps: 2,
  shortMinMicroamps: 100,
};
