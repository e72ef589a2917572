import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { buildAnodeFamily } from '../../../shared/analysis/anode-family';
import type { SweepPoint } from '../../../shared/domain/sweep';
import {
  childLangmuir,
  interiorPoints,
  sampleFamily,
  shuffled,
  type SamplingPlan,
} from './family-sampler';

// Random ideal triodes (Child-Langmuir law, team reference sheet section 2): K and mu drawn,
// the grid step chosen so that several curves conduct under the limits; 8 to 12 grid steps.
const triode = fc.record({
  k: fc.double({ min: 0.3, max: 4, noNaN: true }),
  mu: fc.double({ min: 6, max: 100, noNaN: true }),
  steps: fc.integer({ min: 8, max: 12 }),
  noisy: fc.boolean(),
  seed: fc.integer({ min: 1, max: 1_000_000 }),
  pick: fc.double({ min: 0, max: 1, noNaN: true, maxExcluded: true }),
});

function planFor(t: { k: number; mu: number; steps: number; noisy: boolean }): SamplingPlan {
  // Grid span: the cut-off grid voltage at 250 V; limits: the current at 300 V, zero grid.
  const span = 250 / t.mu;
  const ia = t.k * (300 / t.mu) ** 1.5;
  return {
    vg1Volts: Array.from({ length: t.steps + 1 }, (_, i) => (-span * i) / t.steps),
    vaMaxVolts: 300,
    vaStepVolts: 3,
    iaMaxMilliamps: ia,
    paMaxWatts: (ia * 300) / 1000 / 2,
    noise: t.noisy ? 'tracer' : undefined,
  };
}

describe('properties of the derived figures', () => {
  it('satisfy mu = gm·ra within their stated uncertainties at interior points', () => {
    let checked = 0;
    fc.assert(
      fc.property(triode, (t) => {
        const plan = planFor(t);
        const law = childLangmuir(t.k, t.mu);
        const points = interiorPoints(law, plan);
        fc.pre(points.length > 0);
        const built = buildAnodeFamily(sampleFamily(law, plan, t.seed));
        if (!built.ok) throw new Error(built.reason);
        // Up to eight interior points, starting at a random one.
        const first = Math.floor(t.pick * points.length);
        for (let n = 0; n < Math.min(8, points.length); n++) {
          const [va, vg] = points[(first + n * 7) % points.length];
          const op = built.family.operatingPoint(va, vg);
          if (!op.ok) throw new Error(op.reason);
          const gap = Math.abs(op.mu.value - op.muFromGmRa.value);
          const allowed =
            3 * Math.hypot(op.mu.uncertainty, op.muFromGmRa.uncertainty) + 0.002 * t.mu;
          expect(gap).toBeLessThanOrEqual(allowed);
        }
        checked++;
      }),
      { numRuns: 30, seed: 1729 },
    );
    // The precondition must not have thrown most families away.
    expect(checked).toBeGreaterThanOrEqual(20);
  });

  it('do not depend on the order of the points', () => {
    fc.assert(
      fc.property(triode, fc.integer({ min: 1, max: 1e6 }), (t, order) => {
        const plan = planFor(t);
        const law = childLangmuir(t.k, t.mu);
        const points = sampleFamily(law, plan, t.seed);
        const a = buildAnodeFamily(points);
        const b = buildAnodeFamily(shuffled(points, order));
        if (!a.ok || !b.ok) throw new Error('family refused');
        for (const [va, vg] of interiorPoints(law, plan).slice(0, 4)) {
          expect(b.family.operatingPoint(va, vg)).toEqual(a.family.operatingPoint(va, vg));
        }
      }),
      { numRuns: 12, seed: 4242 },
    );
  });

  it('do not depend on splitting curves into two sweeps', () => {
    fc.assert(
      fc.property(triode, fc.double({ min: 0.2, max: 0.8, noNaN: true }), (t, cut) => {
        const plan = planFor(t);
        const law = childLangmuir(t.k, t.mu);
        const points = sampleFamily(law, plan, t.seed);
        // Two sweeps: the lower part of every curve first, the rest later, with their own
        // sequence numbers and curve indices (the second sweep runs the grid steps in reverse).
        const first: SweepPoint[] = [];
        const second: SweepPoint[] = [];
        const curves = plan.vg1Volts.length;
        for (const p of points) {
          if (p.vaVolts <= cut * plan.vaMaxVolts) first.push({ ...p, seq: first.length });
          else second.push({ ...p, seq: second.length, curve: curves - 1 - p.curve });
        }
        const whole = buildAnodeFamily(points);
        const split = buildAnodeFamily([...second, ...first]);
        if (!whole.ok || !split.ok) throw new Error('family refused');
        for (const [va, vg] of interiorPoints(law, plan).slice(0, 4)) {
          expect(split.family.operatingPoint(va, vg)).toEqual(whole.family.operatingPoint(va, vg));
        }
      }),
      { numRuns: 12, seed: 777 },
    );
  });
});
