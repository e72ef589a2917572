import { describe, expect, it } from 'vitest';
import { buildAnodeFamily } from '../../../shared/analysis/anode-family';
import { korenSurface } from '../../../shared/analysis/anode-surface';
import { dissipationHyperbola } from '../../../shared/analysis/dissipation-hyperbola';
import { findRoot } from '../../../shared/analysis/find-root';
import type { KorenModel } from '../../../shared/analysis/koren-model';
import { analyseLoadLine } from '../../../shared/analysis/load-line';
import { findValveType } from '../../../shared/catalog/valve-types';
import { childLangmuir, korenLaw, lawSurface, sampleFamily } from './family-sampler';

// Ideal triode (Child-Langmuir law; K and mu are test choices) as an exact surface.
const K = 0.94;
const MU = 20;
const law = childLangmuir(K, MU);
const surface = lawSurface(law, { vaMaxVolts: 600, vg1MinVolts: -30, vg1MaxVolts: 0 });

function ok<T extends { ok: boolean }>(r: T | { ok: false; reason: string }): T {
  if (!r.ok) throw new Error((r as { reason: string }).reason);
  return r as T;
}

describe('a resistive load line', () => {
  const load = { kind: 'resistive', supplyVolts: 300, loadKiloohms: 20 } as const;

  it('puts the fixed-bias operating point on both the curve and the line', () => {
    const a = ok(analyseLoadLine(surface, load, { kind: 'fixed', vg1Volts: -6 }));
    const q = a.quiescent;
    expect(q.vaVolts + 20 * q.iaMilliamps).toBeCloseTo(300, 6);
    expect(q.iaMilliamps).toBeCloseTo(law(q.vaVolts, -6, 0).ia, 9);
    expect(q.paWatts).toBeCloseTo((q.vaVolts * q.iaMilliamps) / 1000, 12);
    expect(a.dcLine[0]).toEqual({ vaVolts: 300, iaMilliamps: 0 });
  });

  it('has a small-signal gain of mu·RL/(RL + ra) for a small swing (textbook formula)', () => {
    const a = ok(
      analyseLoadLine(surface, load, { kind: 'fixed', vg1Volts: -6 }, { gridSwingPeakVolts: 0.01 }),
    );
    const x = -6 + a.quiescent.vaVolts / MU;
    const ra = MU / (1.5 * K * Math.sqrt(x));
    expect(Math.abs((a.swing?.voltageGain ?? 0) / ((MU * 20) / (20 + ra)) - 1)).toBeLessThan(1e-3);
  });

  it('solves cathode bias so that Vg1 = -Rk·Ik, with Rk in the DC path', () => {
    const a = ok(analyseLoadLine(surface, load, { kind: 'cathode', cathodeKiloohms: 0.6 }));
    const q = a.quiescent;
    expect(q.vg1Volts + 0.6 * q.iaMilliamps).toBeCloseTo(0, 6);
    expect(q.vaVolts + 20 * q.iaMilliamps + 0.6 * q.iaMilliamps).toBeCloseTo(300, 6);
    expect(q.iaMilliamps).toBeCloseTo(law(q.vaVolts, q.vg1Volts, 0).ia, 9);
  });

  it('gives distortion that agrees with a Fourier analysis of the output current', () => {
    const peak = 4;
    const a = ok(
      analyseLoadLine(surface, load, { kind: 'fixed', vg1Volts: -6 }, { gridSwingPeakVolts: peak }),
    );
    const q = a.quiescent;
    // Independent check: the anode current over one cycle of a sine drive on the same load
    // line, solved here with the law itself, and its harmonics by a discrete Fourier transform.
    const n = 256;
    const ia = Array.from({ length: n }, (_, k) => {
      const vg = -6 + peak * Math.cos((2 * Math.PI * k) / n);
      const va = findRoot((v) => v + 20 * law(v, vg, 0).ia - 300, 0, 300) as number;
      return law(va, vg, 0).ia;
    });
    const harmonic = (h: number) => {
      let re = 0;
      let im = 0;
      ia.forEach((v, k) => {
        re += v * Math.cos((2 * Math.PI * h * k) / n);
        im += v * Math.sin((2 * Math.PI * h * k) / n);
      });
      return (2 * Math.hypot(re, im)) / n;
    };
    const d2 = (100 * harmonic(2)) / harmonic(1);
    const d3 = (100 * harmonic(3)) / harmonic(1);
    const s = a.swing;
    if (!s) throw new Error('no swing');
    expect(Math.abs(s.fivePoint.d2Percent - d2)).toBeLessThan(0.02 * d2);
    expect(Math.abs(s.fivePoint.d3Percent - d3)).toBeLessThan(0.02 + 0.05 * d3);
    expect(Math.abs(s.secondHarmonicThreePointPercent - d2)).toBeLessThan(0.05 * d2);
    // Output power from the swing points, (Vmax - Vmin)(Imax - Imin)/8.
    const [top, , , , bottom] = s.points;
    expect(s.outputPowerWatts).toBeCloseTo(
      ((bottom.vaVolts - top.vaVolts) * (top.iaMilliamps - bottom.iaMilliamps)) / 8000,
      12,
    );
    expect(q.vaVolts).toBeGreaterThan(top.vaVolts);
  });

  it('refuses a swing that leaves the known region', () => {
    const a = analyseLoadLine(
      surface,
      load,
      { kind: 'fixed', vg1Volts: -6 },
      { gridSwingPeakVolts: 8 },
    );
    expect(a.ok).toBe(false);
    if (!a.ok) expect(a.reason).toMatch(/grid swing of 8 V peak/);
  });
});

describe('a transformer load', () => {
  const load = { kind: 'transformer', supplyVolts: 250, loadKiloohms: 5 } as const;

  it('sits at the supply voltage with a vertical DC line and an AC line of slope -1/RL', () => {
    const a = ok(
      analyseLoadLine(surface, load, { kind: 'fixed', vg1Volts: -8 }, { gridSwingPeakVolts: 3 }),
    );
    const q = a.quiescent;
    expect(q.vaVolts).toBeCloseTo(250, 9);
    expect(a.dcLine[0].vaVolts).toBeCloseTo(a.dcLine[1].vaVolts, 9);
    const [p0, p1] = a.acLine;
    expect((p1.iaMilliamps - p0.iaMilliamps) / (p1.vaVolts - p0.vaVolts)).toBeCloseTo(-1 / 5, 9);
    for (const p of a.swing?.points ?? []) {
      expect(p.iaMilliamps - q.iaMilliamps).toBeCloseTo(-(p.vaVolts - q.vaVolts) / 5, 6);
      expect(p.iaMilliamps).toBeCloseTo(law(p.vaVolts, p.vg1Volts, 0).ia, 6);
    }
    // The anode swings above the supply on the negative half-cycle.
    expect(a.swing?.points[4].vaVolts).toBeGreaterThan(250);
  });

  it('finds the cathode resistor that makes a chosen 12AX7 point self-biased', () => {
    // Koren 12AX7 set (Koren, Glass Audio 8(5), 1996, as carried in valve-types.ts). First the
    // fixed-bias current at 250 V, -2 V; then Rk = 2 V / Ik and a supply 2 V higher must land
    // on the same point (Rk = -Vg1/Ik, team reference sheet, section 5).
    const model = findValveType('12AX7')?.model as KorenModel;
    const s = korenSurface(model, { vaMaxVolts: 400, vg1MinVolts: -4, vg1MaxVolts: 0 });
    const fixed = ok(
      analyseLoadLine(
        s,
        { kind: 'transformer', supplyVolts: 250, loadKiloohms: 100 },
        { kind: 'fixed', vg1Volts: -2 },
      ),
    );
    const rk = 2 / fixed.quiescent.iaMilliamps;
    const self = ok(
      analyseLoadLine(
        s,
        { kind: 'transformer', supplyVolts: 252, loadKiloohms: 100 },
        { kind: 'cathode', cathodeKiloohms: rk },
      ),
    );
    expect(self.quiescent.vg1Volts).toBeCloseTo(-2, 6);
    expect(self.quiescent.vaVolts).toBeCloseTo(250, 5);
  });
});

describe('a load line on a measured family', () => {
  it('agrees with the same load line on the model it was sampled from', () => {
    const model = findValveType('12AX7')?.model as KorenModel;
    const points = sampleFamily(korenLaw(model), {
      vg1Volts: Array.from({ length: 13 }, (_, i) => -0.25 * i),
      vaMaxVolts: 400,
      vaStepVolts: 5,
      iaMaxMilliamps: 3,
      paMaxWatts: 1,
    });
    const built = buildAnodeFamily(points);
    if (!built.ok) throw new Error(built.reason);
    const load = { kind: 'resistive', supplyVolts: 300, loadKiloohms: 100 } as const;
    const bias = { kind: 'fixed', vg1Volts: -1.5 } as const;
    const measured = ok(analyseLoadLine(built.family, load, bias, { gridSwingPeakVolts: 0.5 }));
    const s = korenSurface(model, { vaMaxVolts: 400, vg1MinVolts: -3, vg1MaxVolts: 0 });
    const exact = ok(analyseLoadLine(s, load, bias, { gridSwingPeakVolts: 0.5 }));
    expect(measured.quiescent.vaVolts / exact.quiescent.vaVolts - 1).toBeCloseTo(0, 3);
    expect(
      Math.abs((measured.swing?.voltageGain ?? 0) / (exact.swing?.voltageGain ?? 1) - 1),
    ).toBeLessThan(0.005);
  });

  it('refuses a swing beyond the most positive measured curve', () => {
    const model = findValveType('12AX7')?.model as KorenModel;
    const built = buildAnodeFamily(
      sampleFamily(korenLaw(model), {
        vg1Volts: Array.from({ length: 9 }, (_, i) => -0.5 * i),
        vaMaxVolts: 300,
        vaStepVolts: 6,
        iaMaxMilliamps: 3,
        paMaxWatts: 1,
      }),
    );
    if (!built.ok) throw new Error(built.reason);
    const a = analyseLoadLine(
      built.family,
      { kind: 'resistive', supplyVolts: 300, loadKiloohms: 100 },
      { kind: 'fixed', vg1Volts: -1 },
      { gridSwingPeakVolts: 1.5 },
    );
    expect(a.ok).toBe(false);
    if (!a.ok) expect(a.reason).toMatch(/above the most positive measured curve \(0 V\)/);
  });
});

describe('the dissipation limit', () => {
  it('is the hyperbola Ia = Pa,max/Va', () => {
    // 12AX7 Pa max 1.0 W per section (RCA; team reference sheet, section 4), from valve-types.
    const pa = findValveType('12AX7')?.ratings.paMaxWatts as number;
    const curve = dissipationHyperbola(pa, 50, 300, 11);
    expect(curve).toHaveLength(11);
    for (const p of curve) expect((p.vaVolts * p.iaMilliamps) / 1000).toBeCloseTo(pa, 12);
  });

  it('flags an operating point above the rating', () => {
    const a = ok(
      analyseLoadLine(
        surface,
        { kind: 'transformer', supplyVolts: 250, loadKiloohms: 5 },
        { kind: 'fixed', vg1Volts: -4 },
        { paMaxWatts: 2.5 },
      ),
    );
    expect(a.quiescent.paWatts).toBeGreaterThan(2.5);
    expect(a.dissipation).toEqual({ paMaxWatts: 2.5, withinRating: false });
  });
});
