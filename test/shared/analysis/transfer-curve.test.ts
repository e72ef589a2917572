import { describe, expect, it } from 'vitest';
import { buildAnodeFamily } from '../../../shared/analysis/anode-family';
import type { KorenModel } from '../../../shared/analysis/koren-model';
import { anodeFamilyFromTransfers, transferCurve } from '../../../shared/analysis/transfer-curve';
import type { SweepPoint } from '../../../shared/domain/sweep';
import { findValveType } from '../../../shared/catalog/valve-types';
import { korenLaw, sampleFamily } from './family-sampler';
import { korenExpected } from './koren-expressions';

// Published 12AX7 set (Koren, Glass Audio 8(5), 1996, as carried in valve-types.ts); expected
// values from the published expression via mathjs.
const model = findValveType('12AX7')?.model as KorenModel;
const law = korenLaw(model);

describe('a transfer curve derived from an anode family', () => {
  const built = buildAnodeFamily(
    sampleFamily(law, {
      vg1Volts: Array.from({ length: 13 }, (_, i) => -0.25 * i),
      vaMaxVolts: 300,
      vaStepVolts: 5,
      iaMaxMilliamps: 3,
      paMaxWatts: 0.75,
    }),
  );
  if (!built.ok) throw new Error(built.reason);

  it('follows the model over the grid span the curves cover at that Va', () => {
    const t = transferCurve(built.family, 250, 25);
    if (!t.ok) throw new Error(t.reason);
    expect(t.points).toHaveLength(25);
    // At 250 V the more positive curves have stopped at the dissipation limit (0.75 W, 3 mA):
    // the span ends at the most positive curve that reaches 250 V.
    const reaching = built.family.curves.filter((c) => c.vaMaxVolts >= 250).map((c) => c.vg1Volts);
    expect(t.points[0].vg1Volts).toBe(-3);
    expect(t.points[24].vg1Volts).toBe(Math.max(...reaching));
    expect(reaching.length).toBeLessThan(13);
    for (const p of t.points) {
      const e = korenExpected(model, 250, p.vg1Volts);
      expect(Math.abs(p.iaMilliamps.value - e.iaMilliamps)).toBeLessThan(
        0.003 * e.iaMilliamps + 1e-4,
      );
      if (e.iaMilliamps > 0.5) {
        expect(Math.abs(p.gmMicrosiemens.value / e.gmMicrosiemens - 1)).toBeLessThan(0.01);
      }
    }
    expect(t.measured.map((m) => m.vg1Volts)).toEqual(reaching);
  });

  it('refuses a Va that fewer than three curves reach', () => {
    expect(transferCurve(built.family, 400).ok).toBe(false);
  });
});

describe('an anode-family view from transfer sweeps', () => {
  // Transfer sweeps at nine anode voltages, Vg1 from -3 V to 0 V in 0.1 V steps.
  const points: SweepPoint[] = [];
  [100, 125, 150, 175, 200, 225, 250, 275, 300].forEach((va, curve) => {
    for (let n = 0; n <= 30; n++) {
      const vg = -3 + 0.1 * n;
      const c = law(va, vg, 0);
      points.push({
        seq: points.length,
        curve,
        vaVolts: va,
        vg1Volts: vg,
        vg2Volts: 0,
        iaMilliamps: c.ia,
        ig2Milliamps: 0,
      });
    }
  });

  it('gives anode curves that follow the model between the sweeps', () => {
    const view = anodeFamilyFromTransfers(points, { vg1Volts: [-2, -1.5, -1], pointsPerCurve: 41 });
    if (!view.ok) throw new Error(view.reason);
    expect(view.curves.map((c) => c.vg1Volts)).toEqual([-2, -1.5, -1]);
    for (const c of view.curves) {
      expect(c.measured).toHaveLength(9);
      expect(c.points[0].vaVolts).toBe(100);
      expect(c.points[40].vaVolts).toBe(300);
      for (const p of c.points) {
        const e = korenExpected(model, p.vaVolts, c.vg1Volts).iaMilliamps;
        expect(Math.abs(p.iaMilliamps.value - e)).toBeLessThan(0.005 * e + 2e-3);
      }
    }
  });

  it('refuses with fewer than three sweeps', () => {
    expect(anodeFamilyFromTransfers(points.filter((p) => p.vaVolts < 150)).ok).toBe(false);
  });
});
