import { describe, expect, it } from 'vitest';
import { findValveType } from '../../../shared/catalog/valve-types';
import { QUICK_TEST_PARTS } from '../../../shared/grading/quick-test-part';
import { planQuickTest } from '../../../shared/grading/quick-test-plan';
import {
  gmFromTransfer,
  partOutcomes,
  type StepOutcome,
} from '../../../shared/grading/quick-test-results';
import { stopReason } from '../../../shared/grading/quick-test-stop';
import { DEFAULT_QUICK_TEST_THRESHOLDS } from '../../../shared/grading/quick-test-thresholds';
import { expectedStrappedMilliamps } from '../../../shared/grading/expected-emission';
import { CHECK_FEATURES, type PointReading } from '../../../shared/protocol/check-plan';

/*
 * Ideal triode (Child-Langmuir 3/2-power law, reference sheet section 2): Ia = K (Vg + Va/mu)^1.5,
 * so gm = 1.5 K (Vg + Va/mu)^0.5 exactly. K 2 mA/V^1.5, mu 100, 250 V, -2 V: x = 0.5,
 * gm = 2.1213 mA/V.
 */
const K = 2;
const MU = 100;
const ideal = (va: number, vg: number) => K * Math.pow(Math.max(0, vg + va / MU), 1.5);

function points(vg1s: number[], va = 250): PointReading[] {
  return vg1s.map((vg1Volts, seq) => ({
    kind: 'point',
    seq,
    curve: 0,
    vaVolts: va,
    vg1Volts,
    vg2Volts: 0,
    iaMilliamps: ideal(va, vg1Volts),
    ig2Milliamps: 0,
  }));
}

describe('gmFromTransfer', () => {
  it("matches the ideal triode's analytic gm to within 0.2 % by the central difference", () => {
    const m = gmFromTransfer(points([-2.1, -2, -1.9]), -2, 0.1, 12.6);
    if (typeof m === 'string') throw new Error(m);
    const exact = 1.5 * K * Math.sqrt(0.5) * 1000;
    expect(exact).toBeCloseTo(2121.3, 1);
    expect(m.method).toBe('central');
    expect(Math.abs(m.gmMicrosiemens - exact) / exact).toBeLessThan(0.002);
    expect(m.iaMilliamps).toBeCloseTo(ideal(250, -2), 10);
  });

  it('falls back to one side when a point is missing, and says why when it cannot', () => {
    const m = gmFromTransfer(points([-2.1, -2]), -2, 0.1, 12.6);
    expect(typeof m !== 'string' && m.method).toBe('one-sided');
    expect(gmFromTransfer(points([-2.1]), -2, 0.1, 12.6)).toMatch(
      /no reading at the operating point/,
    );
    expect(gmFromTransfer(points([-2]), -2, 0.1, 12.6)).toMatch(/either side/);
  });
});

describe('expectedStrappedMilliamps', () => {
  it('is the Koren triode model at Vg = Va (12AX7 set, Koren 1996)', () => {
    const [mu, ex, kg1, kp, kvb] = [100, 1.4, 1060, 600, 300];
    const va = 10;
    const e1 = (va / kp) * Math.log(1 + Math.exp(kp * (1 / mu + va / Math.sqrt(kvb + va * va))));
    const model = ((2 * Math.pow(e1, ex)) / kg1) * 1000;
    expect(expectedStrappedMilliamps(findValveType('12AX7')!, va)).toBeCloseTo(model, 9);
    expect(expectedStrappedMilliamps(findValveType('EF86')!, va)).toBeNull();
  });
});

describe('partOutcomes and stopReason', () => {
  const plan = planQuickTest({
    type: findValveType('12AX7')!,
    parts: QUICK_TEST_PARTS,
    limits: {
      vaMaxVolts: 500,
      vg2MaxVolts: 450,
      vg1MinVolts: -100,
      vg1MaxVolts: 0,
      iaMaxMilliamps: 250,
      paMaxWatts: 50,
      heaterMaxVolts: 13.2,
    },
    features: CHECK_FEATURES,
    leakageMaxVolts: 200,
  });
  const step = (index: number, changes: Partial<StepOutcome>): StepOutcome => ({
    index,
    role: plan.steps[index].role,
    status: 'complete',
    message: 'done',
    errorCode: null,
    readings: [],
    ...changes,
  });
  const leak = (microamps: number, overRange = false) =>
    step(0, {
      readings: [{ kind: 'leakage', pair: 'anode-cathode', volts: 100, microamps, overRange }],
    });

  it('stops after a leakage check that found a short, and after any trip, fault or abort', () => {
    const t = DEFAULT_QUICK_TEST_THRESHOLDS;
    expect(stopReason(leak(0.05), t)).toBeNull();
    expect(stopReason(leak(500, true), t)).toMatch(/short/);
    expect(stopReason(leak(120), t)).toMatch(/short/);
    expect(stopReason(step(1, { status: 'refused' }), t)).toBeNull();
    expect(stopReason(step(1, { status: 'limit' }), t)).toMatch(/tripped/);
    expect(stopReason(step(1, { status: 'aborted' }), t)).toMatch(/aborted/);
  });

  it('shows each part pending, running, done, failed or skipped as its steps stand', () => {
    const running = partOutcomes(plan, QUICK_TEST_PARTS, [leak(0.05)], null, 1);
    expect(running.map((p) => p.status)).toEqual([
      'done',
      'running',
      'pending',
      'pending',
      'pending',
    ]);
    const gmFault = step(1, { status: 'fault', message: 'E31 short', errorCode: 'E31' });
    const stopped = partOutcomes(plan, QUICK_TEST_PARTS, [leak(0.05), gmFault], 'not run: fault');
    expect(stopped.map((p) => p.status)).toEqual([
      'done',
      'failed',
      'skipped',
      'skipped',
      'failed',
    ]);
    expect(stopped[1]).toMatchObject({ errorCode: 'E31', message: 'E31 short' });
    expect(stopped[2].message).toBe('not run: fault');
  });
});
