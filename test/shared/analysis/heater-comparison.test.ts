import { describe, expect, it } from 'vitest';
import { buildAnodeFamily, type AnodeFamily } from '../../../shared/analysis/anode-family';
import { compareReducedHeater } from '../../../shared/analysis/heater-comparison';
import type { KorenModel } from '../../../shared/analysis/koren-model';
import { findValveType } from '../../../shared/catalog/valve-types';
import { korenLaw, sampleFamily, type SamplingPlan } from './family-sampler';

// Published 12AX7 set (Koren, Glass Audio 8(5), 1996, as carried in valve-types.ts). A worn
// cathode at reduced heater is modelled as lower emission: KG1 up 15 %, so every current and
// gm falls by the factor 1/1.15 exactly (Ia is proportional to 1/KG1 in the model).
const nominalModel = findValveType('12AX7')?.model as KorenModel;
const worn: KorenModel = {
  kind: 'triode',
  params: { ...nominalModel.params, kg1: nominalModel.params.kg1 * 1.15 },
};
const plan: SamplingPlan = {
  vg1Volts: Array.from({ length: 13 }, (_, i) => -0.25 * i),
  vaMaxVolts: 300,
  vaStepVolts: 2,
  iaMaxMilliamps: 3,
  paMaxWatts: 0.75,
  noise: 'tracer',
};

function family(model: KorenModel, seed: number): AnodeFamily {
  const built = buildAnodeFamily(sampleFamily(korenLaw(model), plan, seed));
  if (!built.ok) throw new Error(built.reason);
  return built.family;
}

describe('the reduced-heater comparison', () => {
  it('shows the fall of gm of a worn cathode at the same operating point', () => {
    const c = compareReducedHeater(family(nominalModel, 51), family(worn, 52), 200, -1.25);
    if (!c.ok) throw new Error(c.reason);
    const expected = 100 * (1 / 1.15 - 1);
    expect(Math.abs(c.changePercent.value - expected)).toBeLessThan(2);
    expect(Math.abs(c.changePercent.value - expected)).toBeLessThan(
      3 * c.changePercent.uncertainty + 0.3,
    );
  });

  it('shows no significant change for a sound cathode', () => {
    const c = compareReducedHeater(family(nominalModel, 53), family(nominalModel, 54), 200, -1.25);
    if (!c.ok) throw new Error(c.reason);
    expect(Math.abs(c.changePercent.value)).toBeLessThan(3 * c.changePercent.uncertainty + 0.3);
    expect(Math.abs(c.changePercent.value)).toBeLessThan(2);
  });

  it('refuses where either family cannot give gm', () => {
    const c = compareReducedHeater(family(nominalModel, 55), family(worn, 56), 320, -1.25);
    expect(c.ok).toBe(false);
    if (!c.ok) expect(c.reason).toMatch(/^nominal heater: Va 320 V is above/);
  });
});
