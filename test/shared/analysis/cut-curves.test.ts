import { describe, expect, it } from 'vitest';
import { buildAnodeFamily } from '../../../shared/analysis/anode-family';
import type { KorenModel } from '../../../shared/analysis/koren-model';
import { defaultPlan, findValveType } from '../../../shared/catalog/valve-types';
import { korenLaw, sampleFamily } from './family-sampler';

/*
 * Data-sheet points of power valves sit at their anode rating (EL34 250 V / 250 V / -13.5 V,
 * 100 mA = 25 W, the rating; Mullard data as carried in valve-types.ts), so a sweep held inside
 * the rating cuts the curve just above the point short of its Va. The figures there come from
 * carrying that curve on along its tangent (at most 15 % of Va). Koren EL34 set as carried.
 */
const type = findValveType('EL34')!;
const model = type.model as KorenModel;
const op = type.operatingPoints[0];
const plan = defaultPlan(type);
const law = korenLaw(model);

function truth(): { ia: number; gm: number } {
  const h = 1e-4;
  const ia = (vg: number) => law(op.vaVolts, vg, op.vg2Volts!).ia;
  return {
    ia: ia(op.vg1Volts),
    gm: (1000 * (ia(op.vg1Volts + h) - ia(op.vg1Volts - h))) / (2 * h),
  };
}

function sweep(noise: boolean, seed = 1) {
  return sampleFamily(
    law,
    {
      vg1Volts: plan.vg1Volts,
      vg2Volts: plan.vg2Volts,
      vaMaxVolts: plan.vaStopVolts,
      vaStepVolts: plan.vaStepVolts,
      iaMaxMilliamps: plan.iaMaxMilliamps,
      paMaxWatts: type.ratings.paMaxWatts,
      ...(noise ? { noise: 'tracer' as const } : {}),
    },
    seed,
  );
}

describe('figures at a data-sheet point on the anode rating', () => {
  it('are found on a noiseless EL34 family held to 25 W, within 0.5 % (Ia) and 1 % (gm)', () => {
    const built = buildAnodeFamily(sweep(false));
    if (!built.ok) throw new Error(built.reason);
    // Without the carrying-on the point would be refused: the -12.5 V curve stops short.
    const above = built.family.curves.find((c) => c.vg1Volts === -12.5)!;
    expect(above.vaMaxVolts).toBeLessThan(op.vaVolts);
    const r = built.family.operatingPoint(op.vaVolts, op.vg1Volts);
    if (!r.ok) throw new Error(r.reason);
    expect(r.extendedVolts).toBeGreaterThan(0);
    expect(r.extendedVolts).toBeLessThanOrEqual(0.15 * op.vaVolts);
    const t = truth();
    expect(Math.abs(r.iaMilliamps.value / t.ia - 1)).toBeLessThan(0.005);
    expect(Math.abs(r.gmMicrosiemens.value / t.gm - 1)).toBeLessThan(0.01);
  });

  it('stay within 8 % and two stated uncertainties of the law on noisy sweeps', () => {
    // Pinned seeds: tracer noise of 0.2 % of full scale and 12-bit quantisation.
    for (let seed = 1; seed <= 8; seed++) {
      const built = buildAnodeFamily(sweep(true, seed));
      if (!built.ok) throw new Error(built.reason);
      const r = built.family.operatingPoint(op.vaVolts, op.vg1Volts);
      if (!r.ok) throw new Error(`seed ${seed}: ${r.reason}`);
      const t = truth();
      const gmError = Math.abs(r.gmMicrosiemens.value - t.gm);
      expect(gmError / t.gm, `seed ${seed}`).toBeLessThan(0.08);
      expect(gmError, `seed ${seed}`).toBeLessThan(2 * r.gmMicrosiemens.uncertainty);
      expect(Math.abs(r.iaMilliamps.value / t.ia - 1), `seed ${seed}`).toBeLessThan(0.03);
    }
  });
});
