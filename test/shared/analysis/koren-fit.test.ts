import { describe, expect, it } from 'vitest';
import { fitKorenModel } from '../../../shared/analysis/koren-fit';
import { korenGradient } from '../../../shared/analysis/koren-gradient';
import { korenCurrents, type KorenModel } from '../../../shared/analysis/koren-model';
import { findValveType } from '../../../shared/catalog/valve-types';
import { derivative, parse, type EvalFunction } from 'mathjs';
import { korenLaw, sampleFamily, type SamplingPlan } from './family-sampler';

// Published sets: Koren, Glass Audio 8(5), 1996, as carried in shared/catalog/valve-types.ts.
const plans: Record<string, SamplingPlan> = {
  '12AX7': {
    vg1Volts: Array.from({ length: 13 }, (_, i) => -0.25 * i),
    vaMaxVolts: 300,
    vaStepVolts: 6,
    iaMaxMilliamps: 3,
    paMaxWatts: 0.75,
  },
  '12AU7': {
    vg1Volts: Array.from({ length: 12 }, (_, i) => -1.5 * i),
    vaMaxVolts: 300,
    vaStepVolts: 6,
    iaMaxMilliamps: 20,
    paMaxWatts: 2.75,
  },
  '300B': {
    vg1Volts: Array.from({ length: 13 }, (_, i) => -6 * i),
    vaMaxVolts: 400,
    vaStepVolts: 8,
    iaMaxMilliamps: 200,
    paMaxWatts: 36,
  },
  EL34: {
    vg1Volts: Array.from({ length: 12 }, (_, i) => -2.5 * i),
    vg2Volts: 250,
    vaMaxVolts: 500,
    vaStepVolts: 10,
    iaMaxMilliamps: 250,
    paMaxWatts: 18.75,
  },
};

/** Multiplies each parameter by a factor (same order as the parameter object). */
function scaled(model: KorenModel, factors: number[]): KorenModel {
  const entries = Object.entries(model.params).map(([k, v], i) => [k, v * factors[i]]);
  return { ...model, params: Object.fromEntries(entries) } as KorenModel;
}

describe('fitting a Koren model', () => {
  for (const type of Object.keys(plans)) {
    const published = findValveType(type)?.model as KorenModel;

    it(`recovers the published ${type} set from noiseless curves, started 15-25 % off`, () => {
      const points = sampleFamily(korenLaw(published), plans[type], 31);
      const start = scaled(published, [0.85, 1.1, 1.25, 1.2, 0.8, 1.15]);
      const fit = fitKorenModel(points, start);
      if (!fit.ok) throw new Error(fit.reason);
      const p = fit.model.params as unknown as Record<string, number>;
      const q = published.params as unknown as Record<string, number>;
      expect(Math.abs(p.mu / q.mu - 1)).toBeLessThan(0.02);
      for (const k of ['ex', 'kg1', 'kp', 'kvb'])
        expect(Math.abs(p[k] / q[k] - 1)).toBeLessThan(0.1);
      expect(fit.rmsErrorPercent).toBeLessThan(0.5);
      if (published.kind === 'pentode') {
        expect(fit.kg2Fitted).toBe(true);
        expect(Math.abs(p.kg2 / q.kg2 - 1)).toBeLessThan(0.1);
      }
    });

    it(`fits a noisy ${type} with 10-20 % spread to under 3 % RMS, from the published set`, () => {
      const individual = scaled(published, [1.12, 0.9, 1.2, 0.85, 1.15, 1.2]);
      const plan: SamplingPlan = { ...plans[type], noise: 'tracer' };
      const points = sampleFamily(korenLaw(individual), plan, 32);
      const fit = fitKorenModel(points, published);
      if (!fit.ok) throw new Error(fit.reason);
      expect(fit.rmsErrorPercent).toBeLessThan(3);
      // The fitted MU lands on the individual's, within a few stated uncertainties.
      const mu = fit.model.params.mu;
      expect(Math.abs(mu - individual.params.mu)).toBeLessThan(
        Math.max(5 * (fit.uncertainty.mu ?? 0), 0.02 * mu),
      );
    });
  }

  it('reports RMS error as a percentage of the largest fitted current', () => {
    const model = findValveType('12AU7')?.model as KorenModel;
    const points = sampleFamily(korenLaw(model), plans['12AU7'], 33);
    // Perturb every reading by +1 % of full scale: a fit cannot remove a constant offset
    // from a model that passes through zero, so the RMS error must be close to 1 %.
    const full = Math.max(...points.map((p) => p.iaMilliamps));
    const shifted = points.map((p) => ({ ...p, iaMilliamps: p.iaMilliamps + 0.01 * full }));
    const fit = fitKorenModel(shifted, model);
    if (!fit.ok) throw new Error(fit.reason);
    expect(fit.fullScaleMilliamps).toBeCloseTo(full * 1.01, 6);
    expect(fit.rmsErrorPercent).toBeGreaterThan(0.3);
    expect(fit.rmsErrorPercent).toBeLessThan(1.0);
  });

  it('refuses with too few readings', () => {
    const model = findValveType('12AX7')?.model as KorenModel;
    const fit = fitKorenModel(sampleFamily(korenLaw(model), plans['12AX7'], 1).slice(0, 5), model);
    expect(fit.ok).toBe(false);
  });
});

describe('the analytic gradient the fit uses', () => {
  // Checked against mathjs's symbolic derivatives of the published expressions with respect to
  // each parameter (times the parameter: the fit works in log-parameter space).
  const texts = {
    triode: '2 * (va / kp * log(1 + exp(kp * (1 / mu + vg / sqrt(kvb + va^2)))))^ex / kg1 * 1000',
    pentode:
      '2 * (vg2 / kp * log(1 + exp(kp * (1 / mu + vg / vg2))))^ex / kg1 * atan(va / kvb) * 1000',
  };
  const names = ['mu', 'ex', 'kg1', 'kp', 'kvb'] as const;
  const cache = new Map<string, EvalFunction[]>();
  const derivatives = (kind: 'triode' | 'pentode') => {
    if (!cache.has(kind)) {
      const expr = parse(texts[kind]);
      cache.set(
        kind,
        names.map((n) => derivative(expr, n).compile()),
      );
    }
    return cache.get(kind) as EvalFunction[];
  };
  const at: Record<string, number[][]> = {
    '12AX7': [
      [250, -2, 0],
      [120, -0.5, 0],
      [200, -1.5, 0],
    ],
    '300B': [
      [300, -61, 0],
      [150, -20, 0],
    ],
    EL34: [
      [250, -13.5, 250],
      [100, -5, 200],
    ],
  };
  for (const type of Object.keys(at)) {
    it(`matches the symbolic derivatives for ${type}`, () => {
      const model = findValveType(type)?.model as KorenModel;
      const d = derivatives(model.kind);
      for (const [va, vg, vg2] of at[type]) {
        const ia = korenCurrents(model, va, vg, vg2).iaMilliamps;
        const g = korenGradient(model, ia, va, vg, vg2);
        const scope = { ...model.params, va, vg, vg2 };
        names.forEach((n, k) => {
          const expected = (d[k].evaluate(scope) as number) * model.params[n];
          expect(Math.abs(g[k] - expected)).toBeLessThan(1e-9 * (Math.abs(expected) + ia));
        });
      }
    });
  }
});
