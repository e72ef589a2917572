import { describe, expect, it } from 'vitest';
import { fitKorenModel } from '../../../shared/analysis/koren-fit';
import { korenCurrents, type KorenModel } from '../../../shared/analysis/koren-model';
import { korenSpiceSubcircuit } from '../../../shared/analysis/spice-subcircuit';
import { findValveType } from '../../../shared/catalog/valve-types';
import { korenLaw, sampleFamily } from './family-sampler';
import { readSpiceSubcircuit } from './spice-reader';

describe('the SPICE subcircuit of a fitted model', () => {
  // Published 12AX7 set (Koren, Glass Audio 8(5), 1996, as carried in valve-types.ts),
  // sampled with noise and fitted, so the exported numbers are not round.
  const published = findValveType('12AX7')?.model as KorenModel;
  const points = sampleFamily(
    korenLaw(published),
    {
      vg1Volts: Array.from({ length: 11 }, (_, i) => -0.3 * i),
      vaMaxVolts: 300,
      vaStepVolts: 6,
      iaMaxMilliamps: 3,
      paMaxWatts: 0.75,
      noise: 'tracer',
    },
    41,
  );
  const fit = fitKorenModel(points, published);
  if (!fit.ok) throw new Error(fit.reason);
  const text = korenSpiceSubcircuit(fit.model, 'EMB-12AX7 fit', 'fitted to a test family');

  it('is one .SUBCKT with nodes A G K, a B current source and .ENDS', () => {
    const sub = readSpiceSubcircuit(text);
    expect(sub.name).toBe('EMB_12AX7_fit');
    expect(sub.nodes).toEqual(['A', 'G', 'K']);
    expect(sub.sources.map((s) => [s.name, s.plus, s.minus])).toEqual([['BA', 'A', 'K']]);
    expect(text).toMatch(/^\.ENDS EMB_12AX7_fit$/m);
    expect(text).not.toMatch(/\.PARAM/i);
  });

  it('reads back the fitted parameters', () => {
    const sub = readSpiceSubcircuit(text);
    expect(sub.kind).toBe('triode');
    for (const k of ['mu', 'ex', 'kg1', 'kp', 'kvb'] as const) {
      expect(sub.params[k] / fit.model.params[k] - 1).toBeCloseTo(0, 8);
    }
  });

  it('draws the model current (in A) at every point of a grid', () => {
    const sub = readSpiceSubcircuit(text);
    for (let va = 0; va <= 400; va += 25) {
      for (let vg = -5; vg <= 0; vg += 0.5) {
        const amps = sub.sources[0].current({ A: va + 10, G: vg + 10, K: 10 });
        const expected = korenCurrents(fit.model, va, vg, 0).iaMilliamps / 1000;
        // Nine significant figures per parameter: within 1e-7 relative, or 1 fA.
        expect(Math.abs(amps - expected)).toBeLessThan(1e-7 * expected + 1e-15);
      }
    }
  });

  it('gives no current with the anode below the cathode', () => {
    const sub = readSpiceSubcircuit(text);
    expect(sub.sources[0].current({ A: -50, G: 0, K: 0 })).toBeLessThan(1e-30);
  });

  it('writes a pentode with nodes A G K G2 and an anode and a screen source', () => {
    const el34 = findValveType('EL34')?.model as KorenModel;
    const sub = readSpiceSubcircuit(korenSpiceSubcircuit(el34, 'EMB_EL34'));
    expect(sub.nodes).toEqual(['A', 'G', 'K', 'G2']);
    expect(sub.kind).toBe('pentode');
    expect(sub.params.kg2).toBe(4200);
    const [anode, screen] = sub.sources;
    expect([screen.plus, screen.minus]).toEqual(['G2', 'K']);
    for (const [va, vg, vg2] of [
      [250, -13.5, 250],
      [100, -5, 200],
      [400, -20, 300],
    ]) {
      const c = korenCurrents(el34, va, vg, vg2);
      const v = { A: va, G: vg, K: 0, G2: vg2 };
      expect(anode.current(v) / (c.iaMilliamps / 1000) - 1).toBeCloseTo(0, 6);
      expect(screen.current(v) / (c.ig2Milliamps / 1000) - 1).toBeCloseTo(0, 9);
    }
  });
});
