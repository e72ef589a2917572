import { describe, expect, it } from 'vitest';
import { defaultPlan, findValveType, limitsFromType, VALVE_TYPES } from '../../../shared/catalog/valve-types';
import { checkPlan, readingEndsCurve, readingTrips, strictestLimits, type PlanLimits } from '../../../shared/domain/plan-check';
import { anodeSteps, plannedPointCount, type SweepPlan } from '../../../shared/domain/sweep';

const bench: PlanLimits = {
  vaMaxVolts: 500,
  vg2MaxVolts: 450,
  vg1MinVolts: -100,
  vg1MaxVolts: 0,
  iaMaxMilliamps: 250,
  paMaxWatts: 40,
  heaterMaxVolts: 13.2,
};

function plan12ax7(over: Partial<SweepPlan> = {}): SweepPlan {
  return { ...defaultPlan(findValveType('ECC83')!), ...over };
}

describe('sweep plan checks', () => {
  it('accepts the default plan of every catalogued type against its own ratings and a 500 V bench', () => {
    for (const t of VALVE_TYPES) {
      const limits = strictestLimits(bench, limitsFromType(t));
      expect(checkPlan(defaultPlan(t), limits), t.designation).toEqual([]);
    }
  });

  it('refuses an anode voltage above the 12AX7 maximum of 300 V (RCA; high) and names the field', () => {
    const limits = strictestLimits(bench, limitsFromType(findValveType('12AX7')!));
    const problems = checkPlan(plan12ax7({ vaStopVolts: 350 }), limits);
    expect(problems).toEqual([{ field: 'vaStopVolts', message: 'anode voltage 350 V is above the limit of 300 V' }]);
  });

  it('refuses a dissipation limit above the type rating and a trip current below the curve limit', () => {
    const limits = strictestLimits(bench, limitsFromType(findValveType('12AX7')!));
    const fields = checkPlan(plan12ax7({ paMaxWatts: 1.5, iaTripMilliamps: 1 }), limits).map((p) => p.field);
    expect(fields).toEqual(['paMaxWatts', 'iaTripMilliamps']);
  });

  it('refuses positive grid voltages, a screen voltage on a bench without one, and bad numbers', () => {
    const limits = strictestLimits(bench, limitsFromType(findValveType('12AX7')!));
    expect(checkPlan(plan12ax7({ vg1Volts: [0, 1] }), limits)[0].field).toBe('vg1Volts');
    expect(checkPlan(plan12ax7({ vg2Volts: 100 }), limits)[0].field).toBe('vg2Volts');
    expect(checkPlan(plan12ax7({ vaStepVolts: Number.NaN }), limits)[0].field).toBe('vaStepVolts');
    expect(checkPlan(plan12ax7({ vg1Volts: [] }), limits)[0].field).toBe('vg1Volts');
  });

  it('takes the stricter figure of bench and type for every limit', () => {
    const el34 = limitsFromType(findValveType('EL34')!);
    const s = strictestLimits(bench, el34);
    expect(s.vaMaxVolts).toBe(500); // bench 500 V below the EL34's 800 V (Philips)
    expect(s.paMaxWatts).toBe(25); // EL34 Pa max 25 W (Philips; high) below the bench's 40 W
  });

  it('counts the points of a plan and ends a curve at the current or dissipation limit', () => {
    const p = plan12ax7({ vaStartVolts: 0, vaStopVolts: 300, vaStepVolts: 10, vg1Volts: [0, -1, -2] });
    expect(anodeSteps(p)).toHaveLength(31);
    expect(plannedPointCount(p)).toBe(93);
    expect(readingEndsCurve({ ...p, iaMaxMilliamps: 5, paMaxWatts: 0.75 }, 200, 3.75)).toBe(true);
    expect(readingEndsCurve({ ...p, iaMaxMilliamps: 5, paMaxWatts: 0.75 }, 100, 3)).toBe(false);
    expect(readingTrips({ ...p, iaTripMilliamps: 7.5, paMaxWatts: 0.75 }, 100, 8)).toBe(true);
    expect(readingTrips({ ...p, iaTripMilliamps: 7.5, paMaxWatts: 0.75 }, 250, 4.6)).toBe(true);
    expect(readingTrips({ ...p, iaTripMilliamps: 7.5, paMaxWatts: 0.75 }, 250, 4.4)).toBe(false);
  });
});
