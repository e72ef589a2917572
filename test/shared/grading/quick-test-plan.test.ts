import { describe, expect, it } from 'vitest';
import { findValveType, limitsFromType, VALVE_TYPES } from '../../../shared/catalog/valve-types';
import { checkPlan, strictestLimits, type PlanLimits } from '../../../shared/domain/plan-check';
import { QUICK_TEST_PARTS } from '../../../shared/grading/quick-test-part';
import { gmGridStepVolts, planQuickTest } from '../../../shared/grading/quick-test-plan';
import { CHECK_FEATURES, type CheckPlan } from '../../../shared/protocol/check-plan';

/** The simulated tracer's limits (CAP 500,450,-100,0,250,13.2). */
const TRACER: PlanLimits = {
  vaMaxVolts: 500,
  vg2MaxVolts: 450,
  vg1MinVolts: -100,
  vg1MaxVolts: 0,
  iaMaxMilliamps: 250,
  paMaxWatts: Number.POSITIVE_INFINITY,
  heaterMaxVolts: 13.2,
};

function plan(designation: string, changes: Partial<Parameters<typeof planQuickTest>[0]> = {}) {
  return planQuickTest({
    type: findValveType(designation)!,
    parts: QUICK_TEST_PARTS,
    limits: TRACER,
    features: CHECK_FEATURES,
    leakageMaxVolts: 200,
    ...changes,
  });
}

function checks<K extends CheckPlan['kind']>(p: ReturnType<typeof plan>, kind: K) {
  return p.steps
    .map((s) => s.check)
    .filter((c): c is Extract<CheckPlan, { kind: K }> => c.kind === kind);
}

describe('planQuickTest', () => {
  it("keeps every step of every catalogue type inside the type's ratings and the tracer's limits", () => {
    for (const type of VALVE_TYPES) {
      const p = plan(type.designation);
      const limits = strictestLimits(TRACER, limitsFromType(type));
      for (const c of checks(p, 'transfer')) {
        expect(checkPlan(c.plan, limits), type.designation).toEqual([]);
      }
      for (const c of [...checks(p, 'grid-current'), ...checks(p, 'emission')]) {
        expect(c.paMaxWatts).toBeLessThanOrEqual(type.ratings.paMaxWatts);
        expect(c.iaTripMilliamps).toBeLessThanOrEqual(250);
        expect(c.heaterVolts).toBe(type.heaterVolts);
      }
      for (const c of checks(p, 'emission')) {
        // Half the rated dissipation at most, for a sound valve's expected current.
        const watts = (c.vaVolts * p.reference.expectedEmissionMilliamps!) / 1000;
        expect(watts).toBeLessThanOrEqual(type.ratings.paMaxWatts / 2);
      }
    }
  });

  it('takes gm at the first operating point, 5 % of the bias (at least 0.1 V) either side', () => {
    expect(gmGridStepVolts(-2)).toBe(0.1);
    expect(gmGridStepVolts(-13.5)).toBe(0.7);
    const [gm] = checks(plan('12AX7'), 'transfer');
    // RCA data sheet operating point of the 12AX7 (reference sheet, section 3): 250 V, -2 V.
    expect(gm.plan).toMatchObject({
      kind: 'transfer',
      vaStartVolts: 250,
      vg1Volts: [-2.1, -2, -1.9],
    });
    const [el34] = checks(plan('EL34'), 'transfer');
    expect(el34.plan).toMatchObject({
      vaStartVolts: 250,
      vg2Volts: 250,
      vg1Volts: [-14.2, -13.5, -12.8],
    });
  });

  it('holds the heater-cathode test voltage to the Vhk rating and leaves it out where none is published', () => {
    // 12AT7 Vhk max 90 V (reference sheet, section 4: data sheet; high).
    const [at7] = checks(plan('12AT7'), 'leakage');
    expect(at7.pairs).toEqual([
      { pair: 'heater-cathode', volts: 90 },
      { pair: 'grid1-cathode', volts: 100 },
      { pair: 'grid1-anode', volts: 100 },
      { pair: 'anode-cathode', volts: 100 },
    ]);
    const [b300] = checks(plan('300B'), 'leakage');
    expect(b300.pairs.map((p) => p.pair)).not.toContain('heater-cathode');
    const [el34] = checks(plan('EL34'), 'leakage');
    expect(el34.pairs.map((p) => p.pair)).toEqual(
      expect.arrayContaining(['screen-cathode', 'screen-grid1', 'screen-anode']),
    );
  });

  it('runs leakage first with the whole warm-up, and waits for the cathode after lowering the heater', () => {
    const p = plan('EL34');
    expect(p.steps.map((s) => s.role)).toEqual([
      'leakage',
      'gm',
      'grid-current',
      'emission',
      'gm-reduced-heater',
    ]);
    expect(p.steps[0].check).toMatchObject({ kind: 'leakage', warmupSeconds: 20 });
    const reduced = p.steps[4].check;
    // Common practice: drop the heater 10 % (6.3 V to about 5.7 V).
    expect(reduced.kind === 'transfer' && reduced.plan).toMatchObject({
      heaterVolts: 5.67,
      warmupSeconds: 60,
    });
    expect(p.reference.reducedHeaterVolts).toBe(5.67);
  });

  it('adds its own nominal-heater gm step when the reduced-heater test runs without the gm part', () => {
    const p = plan('12AX7', { parts: ['reduced-heater'] });
    expect(p.steps.map((s) => s.role)).toEqual(['gm-nominal-heater', 'gm-reduced-heater']);
    expect(p.steps[0].check).toMatchObject({ plan: { heaterVolts: 12.6, warmupSeconds: 20 } });
  });

  it('leaves out, with the reason, what the tracer cannot do or the type cannot support', () => {
    const bare = plan('12AX7', { features: [] });
    expect(bare.steps.map((s) => s.role)).toEqual(['gm', 'gm-reduced-heater']);
    expect(bare.skipped).toEqual([
      { part: 'leakage', reason: 'the tracer has no leakage function' },
      { part: 'grid-current', reason: 'the tracer has no grid-current function' },
      { part: 'emission', reason: 'the tracer has no emission function' },
    ]);
    expect(plan('EF86').skipped).toEqual([
      { part: 'emission', reason: 'EF86 has no published model to give the expected emission' },
    ]);
  });

  it('leaves out a part that would break a bench limit, and holds the leakage voltage to it', () => {
    const p = plan('12AX7', { limits: { ...TRACER, vaMaxVolts: 80 } });
    expect(p.skipped.find((s) => s.part === 'gm')!.reason).toMatch(
      /anode voltage 250 V is above the limit of 80 V/,
    );
    expect(checks(p, 'leakage')[0].pairs.every((x) => x.volts === 80)).toBe(true);
  });
});
