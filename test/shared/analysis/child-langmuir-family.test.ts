import { describe, expect, it } from 'vitest';
import { buildAnodeFamily, type AnodeFamily } from '../../../shared/analysis/anode-family';
import { childLangmuir, interiorPoints, sampleFamily, type SamplingPlan } from './family-sampler';

// Ideal triode Ia = K·(Vg + Va/mu)^1.5 (Child, Phys. Rev. 32, 1911; Langmuir, Phys. Rev. 2,
// 1913): gm = 1.5·K·x^0.5, 1/ra = gm/mu, mu exact (team reference sheet, section 2). The values
// of K and mu and the sampling plans are test choices, not published figures.
const families: { name: string; k: number; mu: number; plan: SamplingPlan }[] = [
  {
    name: 'a medium-mu triode (K 0.94 mA/V^1.5, mu 20), grid 0 to -12 V in 1 V steps',
    k: 0.94,
    mu: 20,
    plan: {
      vg1Volts: Array.from({ length: 13 }, (_, i) => -i),
      vaMaxVolts: 300,
      vaStepVolts: 5,
      iaMaxMilliamps: 30,
      paMaxWatts: 4,
    },
  },
  {
    name: 'a high-mu triode (K 3.4 mA/V^1.5, mu 100), grid 0 to -2.4 V in 0.2 V steps',
    k: 3.4,
    mu: 100,
    plan: {
      vg1Volts: Array.from({ length: 13 }, (_, i) => -0.2 * i),
      vaMaxVolts: 300,
      vaStepVolts: 5,
      iaMaxMilliamps: 8,
      paMaxWatts: 1.5,
    },
  },
];

function exact(k: number, mu: number, va: number, vg: number) {
  const x = vg + va / mu;
  const gm = 1.5 * k * Math.sqrt(x);
  return { ia: k * x ** 1.5, gmMicrosiemens: 1000 * gm, raKiloohms: mu / gm, mu };
}

function worstErrors(family: AnodeFamily, k: number, mu: number, points: [number, number][]) {
  const worst = { ia: 0, gm: 0, ra: 0, mu: 0, muFromGmRa: 0 };
  const rel = (a: number, b: number) => Math.abs(a / b - 1);
  for (const [va, vg] of points) {
    const op = family.operatingPoint(va, vg);
    if (!op.ok) throw new Error(`refused at ${va} V, ${vg} V: ${op.reason}`);
    const e = exact(k, mu, va, vg);
    worst.ia = Math.max(worst.ia, rel(op.iaMilliamps.value, e.ia));
    worst.gm = Math.max(worst.gm, rel(op.gmMicrosiemens.value, e.gmMicrosiemens));
    worst.ra = Math.max(worst.ra, rel(op.raKiloohms.value, e.raKiloohms));
    worst.mu = Math.max(worst.mu, rel(op.mu.value, e.mu));
    worst.muFromGmRa = Math.max(worst.muFromGmRa, rel(op.muFromGmRa.value, e.mu));
  }
  return worst;
}

describe('an anode family of the ideal (Child-Langmuir) triode', () => {
  for (const f of families) {
    describe(f.name, () => {
      const law = childLangmuir(f.k, f.mu);
      const points = interiorPoints(law, f.plan);

      it('has interior points to check', () => {
        expect(points.length).toBeGreaterThanOrEqual(10);
      });

      it('gives Ia, gm, ra and mu within 0.5 % of the exact values without noise', () => {
        const built = buildAnodeFamily(sampleFamily(law, f.plan, 11));
        if (!built.ok) throw new Error(built.reason);
        const worst = worstErrors(built.family, f.k, f.mu, points);
        expect(worst.ia).toBeLessThan(0.005);
        expect(worst.gm).toBeLessThan(0.005);
        expect(worst.ra).toBeLessThan(0.005);
        expect(worst.mu).toBeLessThan(0.005);
        expect(worst.muFromGmRa).toBeLessThan(0.005);
      });

      it('finds the grid voltage that gives a current at a Va, and the same figures there', () => {
        const built = buildAnodeFamily(sampleFamily(law, f.plan, 13));
        if (!built.ok) throw new Error(built.reason);
        for (const [va, vg] of points) {
          const byCurrent = built.family.operatingPointAtCurrent(va, exact(f.k, f.mu, va, vg).ia);
          if (!byCurrent.ok) throw new Error(byCurrent.reason);
          // dVg1 = dIa/gm: 0.1 % of the current is well under a millivolt here.
          expect(Math.abs(byCurrent.vg1Volts.value - vg)).toBeLessThan(2e-3);
          const e = exact(f.k, f.mu, va, byCurrent.vg1Volts.value);
          expect(Math.abs(byCurrent.gmMicrosiemens.value / e.gmMicrosiemens - 1)).toBeLessThan(
            0.005,
          );
          expect(Math.abs(byCurrent.raKiloohms.value / e.raKiloohms - 1)).toBeLessThan(0.005);
        }
      });

      it('gives them within 3 % with tracer noise on a fine sweep', () => {
        // Noise: sigma 0.2 % of full scale plus 12-bit quantisation (see sampleFamily); Va in
        // 2 V mean steps, about 150 readings per curve.
        const plan: SamplingPlan = { ...f.plan, vaStepVolts: 2, noise: 'tracer' };
        const built = buildAnodeFamily(sampleFamily(law, plan, 12));
        if (!built.ok) throw new Error(built.reason);
        const worst = worstErrors(built.family, f.k, f.mu, points);
        expect(worst.ia).toBeLessThan(0.03);
        expect(worst.gm).toBeLessThan(0.03);
        expect(worst.ra).toBeLessThan(0.03);
        expect(worst.mu).toBeLessThan(0.03);
      });
    });
  }
});
