import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { buildAnodeFamily, type AnodeFamily } from '../../../shared/analysis/anode-family';
import type { KorenModel } from '../../../shared/analysis/koren-model';
import { findValveType } from '../../../shared/catalog/valve-types';
import { korenLaw, sampleFamily } from './family-sampler';

// A 12AX7 family from the published Koren set (Koren, Glass Audio 8(5), 1996, as carried in
// valve-types.ts), grid 0 to -4 V, swept to 300 V with a 3 mA current limit.
const model = findValveType('12AX7')?.model as KorenModel;
const points = sampleFamily(korenLaw(model), {
  vg1Volts: Array.from({ length: 9 }, (_, i) => -0.5 * i),
  vaMaxVolts: 300,
  vaStepVolts: 5,
  iaMaxMilliamps: 3,
  paMaxWatts: 0.75,
});

function family(pts = points): AnodeFamily {
  const built = buildAnodeFamily(pts);
  if (!built.ok) throw new Error(built.reason);
  return built.family;
}

function reason(r: { ok: boolean; reason?: string }): string {
  expect(r.ok).toBe(false);
  return r.reason ?? '';
}

describe('the analysis refuses outside the measured region', () => {
  const f = family();
  const top = (vg: number) => f.curves.find((c) => c.vg1Volts === vg)?.vaMaxVolts ?? NaN;

  it('names the curve and its range when Va is above it', () => {
    const r = reason(f.operatingPoint(320, -2));
    expect(r).toBe(
      `Va 320 V is above the measured range of the -2 V curve (0-${Number(top(-2).toPrecision(4))} V)`,
    );
  });

  it('refuses Va far above a curve that stopped at the current limit', () => {
    // The 0 V curve reaches 3 mA well below 300 V; a cut curve is carried on by at most 15 % of
    // Va (CUT_CURVE_EXTENSION), and 30 % of its end is beyond that.
    expect(top(0)).toBeLessThan(200);
    expect(reason(f.operatingPoint(1.3 * top(0), -0.25))).toMatch(
      /above the measured range of the 0 V curve/,
    );
  });

  it('carries a curve cut at the current limit a little way on, saying how far', () => {
    const va = top(0) + 5;
    const carried = f.operatingPoint(va, -0.25);
    if (!carried.ok) throw new Error(carried.reason);
    expect(carried.extendedVolts).toBeCloseTo(5, 6);
    const inside = f.operatingPoint(top(0), -0.25);
    if (!inside.ok) throw new Error(inside.reason);
    expect(inside.extendedVolts).toBe(0);
    // Against the law itself (noiseless readings): within 0.5 % and its stated uncertainty.
    const law = korenLaw(model);
    const ia = law(va, -0.25, 0).ia;
    expect(Math.abs(carried.iaMilliamps.value - ia) / ia).toBeLessThan(0.005);
    expect(Math.abs(carried.iaMilliamps.value - ia)).toBeLessThan(
      3 * carried.iaMilliamps.uncertainty + 1e-4,
    );
  });

  it('refuses a grid voltage beyond the measured curves', () => {
    expect(reason(f.operatingPoint(200, 0.5))).toMatch(
      /Vg1 0.5 V is above the most positive measured curve \(0 V\)/,
    );
    expect(reason(f.operatingPoint(200, -4.5))).toMatch(
      /Vg1 -4.5 V is below the most negative measured curve \(-4 V\)/,
    );
  });

  it('refuses a point where the valve is cut off', () => {
    expect(reason(f.operatingPoint(100, -3.5))).toMatch(/cut off/);
  });

  it('refuses a current no curve reaches at that Va', () => {
    expect(reason(f.operatingPointAtCurrent(250, 50))).toMatch(
      /Ia 50 mA at Va 250 V is above the highest current measured there/,
    );
  });

  it('refuses Va inside a gap in a curve', () => {
    const gappy = family(
      points.filter((p) => !(p.vg1Volts === -1.5 && p.vaVolts > 150 && p.vaVolts < 220)),
    );
    expect(reason(gappy.operatingPoint(185, -1.5))).toMatch(
      /falls in a gap in the measurements of the -1.5 V curve \(1\d\d(\.\d+)?-2\d\d(\.\d+)? V\)/,
    );
  });

  it('refuses a family of fewer than three curves', () => {
    const built = buildAnodeFamily(points.filter((p) => p.vg1Volts >= -0.5));
    expect(built.ok).toBe(false);
  });

  it('never answers for a Va beyond every curve or a grid voltage beyond the family', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 301, max: 2000, noNaN: true }),
        fc.double({ min: -4, max: 0, noNaN: true }),
        (va, vg) => {
          expect(f.operatingPoint(va, vg).ok).toBe(false);
        },
      ),
      { numRuns: 50, seed: 99 },
    );
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 300, noNaN: true }),
        fc.oneof(
          fc.double({ min: 0.001, max: 50, noNaN: true }),
          fc.double({ min: -50, max: -4.001, noNaN: true }),
        ),
        (va, vg) => {
          expect(f.operatingPoint(va, vg).ok).toBe(false);
        },
      ),
      { numRuns: 50, seed: 98 },
    );
  });
});
