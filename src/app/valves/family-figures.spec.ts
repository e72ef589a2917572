import {
  CHILD_LANGMUIR_PLAN,
  childLangmuirFigures,
  childLangmuirPoints,
  WORKED_K,
} from '../../testing/child-langmuir-points';
import type { OperatingPointView } from '../types/types-api';
import { figuresAtOperatingPoints, figureText, operatingPointText } from './family-figures';

/** A typical operating point for these specs; the figures are test choices, not a data sheet. */
function point(over: Partial<OperatingPointView>): OperatingPointView {
  return {
    vaVolts: 250,
    vg2Volts: null,
    vg1Volts: -1,
    iaMilliamps: 1.25,
    ig2Milliamps: null,
    gmMicrosiemens: 1250,
    raKiloohms: 80,
    mu: 100,
    source: 'test choice',
    confidence: null,
    ...over,
  };
}

// Ideal triode (Child-Langmuir 3/2-power law), K and mu 100 as the team reference sheet's worked
// gain example: at 250 V / -1 V exactly Ia 1.25 mA, gm 1.25 mA/V, ra 80 kΩ, mu 100.
const POINTS = childLangmuirPoints(WORKED_K, 100, CHILD_LANGMUIR_PLAN);

describe('figuresAtOperatingPoints', () => {
  it('reads Ia, gm, ra and mu off the family at each point, beside the published figures', () => {
    const [first, second] = figuresAtOperatingPoints(
      [point({}), point({ vaVolts: 250, vg1Volts: -2, gmMicrosiemens: 1000, raKiloohms: null })],
      CHILD_LANGMUIR_PLAN,
      POINTS,
    );
    expect(first.refusal).toBeNull();
    const byName = Object.fromEntries(first.figures.map((f) => [f.figure, f]));
    expect(byName['Ia'].measured).toBeCloseTo(1.25, 2);
    expect(byName['gm'].measured).toBeCloseTo(1.25, 2);
    expect(byName['gm'].unit).toBe('mA/V');
    expect(byName['ra'].measured).toBeCloseTo(80, 0);
    expect(byName['mu'].measured).toBeCloseTo(100, 0);
    expect(byName['gm'].percent).toBeCloseTo(100, 0);
    expect(byName['ra'].percent).toBeCloseTo(100, 0);

    const exact = childLangmuirFigures(WORKED_K, 100, 250, -2);
    const gm2 = second.figures.find((f) => f.figure === 'gm')!;
    expect(gm2.measured).toBeCloseTo(exact.gmMilliampsPerVolt, 2);
    expect(gm2.percent).toBeCloseTo(exact.gmMilliampsPerVolt * 100, 0);
    const ra2 = second.figures.find((f) => f.figure === 'ra')!;
    expect(ra2.nominal).toBeNull();
    expect(ra2.percent).toBeNull();
  });

  it('gives the reason where the family does not reach the point', () => {
    const [outside] = figuresAtOperatingPoints(
      [point({ vaVolts: 600 })],
      CHILD_LANGMUIR_PLAN,
      POINTS,
    );
    expect(outside.figures).toEqual([]);
    expect(outside.refusal).toMatch(/600/);
  });

  it('carries a curve the sweep cut short on to the point, and says by how much', () => {
    // The -1 V curve stops at 240 V, as at a current limit; the point lies between it and -1.25 V.
    const cut = POINTS.filter((p) => !(p.vg1Volts === -1 && p.vaVolts > 240));
    const [carried] = figuresAtOperatingPoints(
      [point({ vg1Volts: -1.1 })],
      CHILD_LANGMUIR_PLAN,
      cut,
    );
    expect(carried.refusal).toBeNull();
    expect(carried.extendedVolts).toBeCloseTo(10, 6);
    const exact = childLangmuirFigures(WORKED_K, 100, 250, -1.1);
    const ia = carried.figures.find((f) => f.figure === 'Ia')!.measured!;
    expect(Math.abs(ia / exact.iaMilliamps - 1)).toBeLessThan(0.01);
    const [inside] = figuresAtOperatingPoints([point({})], CHILD_LANGMUIR_PLAN, POINTS);
    expect(inside.extendedVolts).toBe(0);
  });

  it('refuses a point whose screen voltage the sweep did not run', () => {
    const pentodePlan = { ...CHILD_LANGMUIR_PLAN, vg2Volts: 200 };
    const [screen] = figuresAtOperatingPoints([point({ vg2Volts: 250 })], pentodePlan, POINTS);
    expect(screen.refusal).toBe('the sweep ran the screen at 200 V; this point needs 250 V');
  });

  it('refuses a transfer curve and a family of too few curves', () => {
    const transfer = { ...CHILD_LANGMUIR_PLAN, kind: 'transfer' as const };
    expect(figuresAtOperatingPoints([point({})], transfer, POINTS)[0].refusal).toBe(
      'figures come from anode-family sweeps only',
    );
    const twoCurves = POINTS.filter((p) => p.curve < 2);
    expect(
      figuresAtOperatingPoints([point({})], CHILD_LANGMUIR_PLAN, twoCurves)[0].refusal,
    ).toMatch(/at least three curves/);
  });
});

describe('figure texts', () => {
  it('keeps three significant digits and names the screen only where there is one', () => {
    expect(figureText(0.054512)).toBe('0.0545');
    expect(figureText(62.54)).toBe('62.5');
    expect(figureText(1234.56)).toBe('1234.6');
    expect(figureText(null)).toBe('—');
    expect(operatingPointText({ vaVolts: 250, vg2Volts: null, vg1Volts: -2 })).toBe(
      'Va 250 V, Vg1 -2 V',
    );
    expect(operatingPointText({ vaVolts: 250, vg2Volts: 250, vg1Volts: -13.5 })).toBe(
      'Va 250 V, Vg2 250 V, Vg1 -13.5 V',
    );
  });
});
