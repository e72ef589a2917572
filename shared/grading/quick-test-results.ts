import type { SweepEndReason } from '../domain/sweep';
import type {
  CheckReading,
  ElectrodePair,
  GridCurrentReading,
  LeakageReading,
  PointReading,
} from '../protocol/check-plan';
import type { DeviceErrorCode } from '../protocol/messages';
import { formatFigure } from './format-figure';
import { PART_TITLES, type QuickTestPart } from './quick-test-part';
import {
  gmGridStepVolts,
  type QuickTestPlan,
  type QuickTestReference,
  type QuickTestRole,
} from './quick-test-plan';

/** How one step (one check on the bench) ended, with what it read. */
export interface StepOutcome {
  /** Index of the step in the plan. */
  index: number;
  /** What the step measured. */
  role: QuickTestRole;
  /** How the check ended: a sweep end reason, or 'refused' when it never started. */
  status: SweepEndReason | 'refused';
  /** Why it ended, in words. */
  message: string;
  /** The tracer's error code behind a fault or trip (E30 open heater, E31 short...), or null. */
  errorCode: DeviceErrorCode | null;
  /** Every reading the check reported. */
  readings: CheckReading[];
}

/** gm measured on a three-point transfer curve at the operating point. */
export interface GmMeasurement {
  /** Anode voltage, V. */
  vaVolts: number;
  /** Screen voltage, V. */
  vg2Volts: number;
  /** Grid-1 voltage of the operating point, V. */
  vg1Volts: number;
  /** Heater voltage, V. */
  heaterVolts: number;
  /** Grid step either side of the operating point, V. */
  gridStepVolts: number;
  /** Anode current at the operating point, mA. */
  iaMilliamps: number;
  /** Mutual conductance, uS. */
  gmMicrosiemens: number;
  /** central: (Ia(+d) - Ia(-d)) / 2d; one-sided when one side was out of reach. */
  method: 'central' | 'one-sided';
}

/** Leakage and shorts: every pair measured. */
export interface LeakageResult {
  part: 'leakage';
  pairs: Omit<LeakageReading, 'kind'>[];
}

/** gm at the operating point, against the data sheet. */
export interface GmResult {
  part: 'gm';
  measurement: GmMeasurement;
  /** Data-sheet gm, uS. */
  nominalGmMicrosiemens: number;
  /** Measured gm as a percentage of the data sheet's, %. */
  gmPercent: number;
  /** Data-sheet Ia, mA. */
  nominalIaMilliamps: number;
  /** Measured Ia as a percentage of the data sheet's, %. */
  iaPercent: number;
}

/** Grid current at the operating point. */
export interface GridCurrentResult extends Omit<GridCurrentReading, 'kind'> {
  part: 'grid-current';
}

/** Emission with the grids strapped to the anode, against the model's sound valve. */
export interface EmissionResult {
  part: 'emission';
  /** Anode (and grids) voltage, V. */
  vaVolts: number;
  /** Current read, mA. */
  milliamps: number;
  /** Whether the reading was beyond the range. */
  overRange: boolean;
  /** A sound valve's current by the type's model, mA. */
  expectedMilliamps: number;
  /** Reading as a percentage of the expected current, %. */
  percent: number;
}

/** gm at the nominal and at the reduced heater voltage. */
export interface ReducedHeaterResult {
  part: 'reduced-heater';
  nominal: GmMeasurement;
  reduced: GmMeasurement;
  /** Fall of gm from nominal to reduced heater, % (negative: it rose). */
  dropPercent: number;
}

/** The result of any part. */
export type PartResult =
  LeakageResult | GmResult | GridCurrentResult | EmissionResult | ReducedHeaterResult;

/** Where a part stands. */
export type PartStatus = 'pending' | 'running' | 'done' | 'failed' | 'skipped';

/** One part of a quick test as the record shows it. */
export interface PartOutcome {
  part: QuickTestPart;
  status: PartStatus;
  /** Why it failed or was skipped, or null. */
  message: string | null;
  /** The tracer's error code behind a failure, or null. */
  errorCode: DeviceErrorCode | null;
  /** The figures, once done. */
  result: PartResult | null;
}

/**
 * gm from the points of a transfer check at the operating point: (Ia(vg1 + d) - Ia(vg1 - d)) / 2d
 * from the points either side, or one-sided when one of them is missing (a curve that reached
 * its limit, or a grid step beyond the tracer's range). A reason in words when it cannot.
 */
export function gmFromTransfer(
  points: readonly PointReading[],
  vg1Volts: number,
  gridStepVolts: number,
  heaterVolts: number,
): GmMeasurement | string {
  const at = (v: number) => points.find((p) => Math.abs(p.vg1Volts - v) < 1e-3);
  const mid = at(vg1Volts);
  if (!mid) return `no reading at the operating point's ${formatFigure(vg1Volts)} V grid voltage`;
  const up = at(vg1Volts + gridStepVolts);
  const down = at(vg1Volts - gridStepVolts);
  const base = {
    vaVolts: mid.vaVolts,
    vg2Volts: mid.vg2Volts,
    vg1Volts,
    heaterVolts,
    gridStepVolts,
    iaMilliamps: mid.iaMilliamps,
  };
  let slope: number;
  let method: GmMeasurement['method'] = 'central';
  if (up && down) slope = (up.iaMilliamps - down.iaMilliamps) / (2 * gridStepVolts);
  else if (up) {
    slope = (up.iaMilliamps - mid.iaMilliamps) / gridStepVolts;
    method = 'one-sided';
  } else if (down) {
    slope = (mid.iaMilliamps - down.iaMilliamps) / gridStepVolts;
    method = 'one-sided';
  } else return 'no reading either side of the operating point to take gm from';
  return { ...base, gmMicrosiemens: round1(slope * 1000), method };
}

/**
 * The parts of a quick test from what its steps read: each part done (with its figures),
 * failed (with the reason), skipped (by the plan, or because the test stopped before it), or
 * still pending while the test runs. `stopped` gives the reason for parts never reached.
 */
export function partOutcomes(
  plan: QuickTestPlan,
  parts: readonly QuickTestPart[],
  steps: readonly (StepOutcome | undefined)[],
  stopped: string | null,
  runningIndex: number | null = null,
): PartOutcome[] {
  return parts.map((part): PartOutcome => {
    const skip = plan.skipped.find((s) => s.part === part);
    if (skip) return outcome(part, 'skipped', skip.reason);
    const own = plan.steps.flatMap((s, i) => (s.part === part ? [i] : []));
    const indices = [...own];
    // The reduced-heater test reads its nominal gm from the gm part's step when there is one.
    if (part === 'reduced-heater') {
      const gm = plan.steps.findIndex((s) => s.role === 'gm');
      if (gm >= 0) indices.unshift(gm);
    }
    const failed = indices.map((i) => steps[i]).find((s) => s && s.status !== 'complete');
    if (failed) return { ...outcome(part, 'failed', failed.message), errorCode: failed.errorCode };
    if (indices.some((i) => steps[i] === undefined)) {
      if (runningIndex !== null && own.includes(runningIndex)) {
        return outcome(part, 'running', null);
      }
      return stopped === null ? outcome(part, 'pending', null) : outcome(part, 'skipped', stopped);
    }
    const result = resultOf(
      part,
      plan,
      indices.map((i) => steps[i]!),
    );
    return typeof result === 'string'
      ? outcome(part, 'failed', result)
      : { ...outcome(part, 'done', null), result };
  });
}

function outcome(part: QuickTestPart, status: PartStatus, message: string | null): PartOutcome {
  return { part, status, message, errorCode: null, result: null };
}

function resultOf(
  part: QuickTestPart,
  plan: QuickTestPlan,
  steps: StepOutcome[],
): PartResult | string {
  const ref = plan.reference;
  const readings = <K extends CheckReading['kind']>(s: StepOutcome, kind: K) =>
    s.readings.filter((r): r is Extract<CheckReading, { kind: K }> => r.kind === kind);
  switch (part) {
    case 'leakage': {
      const pairs = readings(steps[0], 'leakage').map(({ kind: _kind, ...r }) => r);
      if (pairs.length === 0) return 'the tracer reported no pair';
      return { part, pairs };
    }
    case 'gm': {
      const m = gm(steps[0], ref, ref.heaterVolts);
      if (typeof m === 'string') return m;
      const nominal = ref.gmMicrosiemens ?? NaN;
      return {
        part,
        measurement: m,
        nominalGmMicrosiemens: nominal,
        gmPercent: round1((m.gmMicrosiemens / nominal) * 100),
        nominalIaMilliamps: ref.iaMilliamps,
        iaPercent: round1((m.iaMilliamps / ref.iaMilliamps) * 100),
      };
    }
    case 'grid-current': {
      const r = readings(steps[0], 'grid-current')[0];
      if (!r) return 'the tracer reported no grid-current reading';
      const { kind: _kind, ...rest } = r;
      return { part, ...rest };
    }
    case 'emission': {
      const r = readings(steps[0], 'emission')[0];
      const expected = ref.expectedEmissionMilliamps;
      if (!r) return 'the tracer reported no emission reading';
      if (expected === null) return 'no expected emission to compare with';
      return {
        part,
        vaVolts: r.vaVolts,
        milliamps: r.milliamps,
        overRange: r.overRange,
        expectedMilliamps: expected,
        percent: round1((r.milliamps / expected) * 100),
      };
    }
    case 'reduced-heater': {
      const nominal = gm(steps[0], ref, ref.heaterVolts);
      const reduced = gm(steps[steps.length - 1], ref, ref.reducedHeaterVolts);
      if (typeof nominal === 'string') return `at nominal heater: ${nominal}`;
      if (typeof reduced === 'string') return `at reduced heater: ${reduced}`;
      if (!(nominal.gmMicrosiemens > 0)) return 'gm at nominal heater is not above zero';
      const drop = (1 - reduced.gmMicrosiemens / nominal.gmMicrosiemens) * 100;
      return { part, nominal, reduced, dropPercent: round1(drop) };
    }
  }
}

function gm(step: StepOutcome, ref: QuickTestReference, heaterVolts: number) {
  const points = step.readings.filter((r): r is PointReading => r.kind === 'point');
  return gmFromTransfer(points, ref.vg1Volts, gmGridStepVolts(ref.vg1Volts), heaterVolts);
}

/** Words for an electrode pair, e.g. "heater-cathode". */
export function pairTitle(pair: ElectrodePair): string {
  return pair.replace('grid1', 'grid 1');
}

/** Words for a part. */
export function partTitle(part: QuickTestPart): string {
  return PART_TITLES[part];
}

function round1(x: number): number {
  return Math.round(x * 10) / 10;
}
