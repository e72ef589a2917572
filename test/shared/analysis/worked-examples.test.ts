import { describe, expect, it } from 'vitest';
import {
  cathodeResistorKiloohms,
  commonCathodeGain,
  muFromGmRa,
} from '../../../shared/analysis/amplifier-stage';
import { buildAnodeFamily } from '../../../shared/analysis/anode-family';
import {
  fivePointDistortion,
  threePointSecondHarmonicPercent,
} from '../../../shared/analysis/harmonic-distortion';
import { VALVE_TYPES } from '../../../shared/catalog/valve-types';
import { sampleFamily } from './family-sampler';

describe('the textbook triode Ia = 41·(Va + 7·Vg)^1.41 µA', () => {
  // Verma, Concepts of Physics (from memory as attribution; team reference sheet, section 5):
  // at Va 250 V, Vg -20 V: Ia 30.98 mA, ra ≈ 2.52 kΩ, gm ≈ 2780 µS, mu = 7.
  const law = (va: number, vg: number) => {
    const x = va + 7 * vg;
    return { ia: x > 0 ? 0.041 * x ** 1.41 : 0, ig2: 0 };
  };
  const points = sampleFamily(law, {
    vg1Volts: Array.from({ length: 11 }, (_, i) => -4 * i),
    vaMaxVolts: 400,
    vaStepVolts: 5,
    iaMaxMilliamps: 120,
    paMaxWatts: 40,
  });
  const built = buildAnodeFamily(points);
  if (!built.ok) throw new Error(built.reason);
  const op = built.family.operatingPoint(250, -20);
  if (!op.ok) throw new Error(op.reason);

  it('gives Ia 30.98 mA at 250 V, -20 V (Verma, from memory)', () => {
    expect(op.iaMilliamps.value).toBeCloseTo(30.98, 1);
    expect(Math.abs(op.iaMilliamps.value / 30.98 - 1)).toBeLessThan(0.001);
  });

  it('gives ra 2.52 kΩ (Verma, from memory; the value is given to three figures)', () => {
    expect(Math.abs(op.raKiloohms.value / 2.52 - 1)).toBeLessThan(0.005);
  });

  it('gives gm 2780 µS (Verma, from memory; three figures)', () => {
    expect(Math.abs(op.gmMicrosiemens.value / 2780 - 1)).toBeLessThan(0.005);
  });

  it('gives mu 7, directly and as gm·ra (Verma, from memory; exact for this law)', () => {
    expect(op.muMethod).toBe('va-shift');
    expect(Math.abs(op.mu.value / 7 - 1)).toBeLessThan(0.005);
    expect(Math.abs(op.muFromGmRa.value / 7 - 1)).toBeLessThan(0.005);
  });
});

describe('harmonic distortion from load-line currents', () => {
  // Espley, Proc. IRE 21, 1933 (five-point) and the three-point method (RCA manuals;
  // Langford-Smith, Radiotron Designer's Handbook, 4th ed., 1953); worked values from the team
  // reference sheet, section 5: Imax 100, Ix 75, Io 50, Iy 28, Imin 10 mA.
  const currents = {
    maxMilliamps: 100,
    xMilliamps: 75,
    zeroMilliamps: 50,
    yMilliamps: 28,
    minMilliamps: 10,
  };

  it('gives B1 45.667, B2 2.5, B3 -0.6667, B4 -0.1667 mA by the five-point method', () => {
    const d = fivePointDistortion(currents);
    expect(d.b1Milliamps).toBeCloseTo(45.667, 3);
    expect(d.b2Milliamps).toBeCloseTo(2.5, 4);
    expect(d.b3Milliamps).toBeCloseTo(-0.6667, 4);
    expect(d.b4Milliamps).toBeCloseTo(-0.1667, 4);
  });

  it('gives D2 5.474 %, D3 1.460 %, D4 0.365 % by the five-point method', () => {
    const d = fivePointDistortion(currents);
    expect(d.d2Percent).toBeCloseTo(5.474, 3);
    expect(d.d3Percent).toBeCloseTo(1.46, 3);
    expect(d.d4Percent).toBeCloseTo(0.365, 3);
  });

  it('gives D2 5.556 % by the three-point method', () => {
    expect(threePointSecondHarmonicPercent(100, 50, 10)).toBeCloseTo(5.556, 3);
  });
});

describe('common-cathode stage figures', () => {
  // Team reference sheet, section 5 (textbook formulas): mu 100, ra 80 kΩ, RL 150 kΩ.
  it('gives a gain of 65.2 with the cathode bypassed', () => {
    expect(commonCathodeGain({ mu: 100, raKiloohms: 80, loadKiloohms: 150 })).toBeCloseTo(65.2, 1);
  });

  it('gives 26.63 with 3.3 kΩ unbypassed', () => {
    const gain = commonCathodeGain({
      mu: 100,
      raKiloohms: 80,
      loadKiloohms: 150,
      cathodeKiloohms: 3.3,
      bypassed: false,
    });
    expect(gain).toBeCloseTo(26.63, 2);
  });

  it('gives the 12AX7 cathode resistor for -2 V at 1.2 mA as 1.667 kΩ', () => {
    // Team reference sheet, section 5, with the RCA data-sheet point (section 3).
    expect(cathodeResistorKiloohms(-2, 1.2)).toBeCloseTo(1.667, 3);
  });
});

describe('gm·ra = mu on the data-sheet rows carried in the type library', () => {
  // Rows of shared/catalog/valve-types.ts with gm, ra and mu (team reference sheet, section 3;
  // each row's source is named in the test title). Data-sheet figures are rounded, so 2 %.
  const rows = VALVE_TYPES.flatMap((t) =>
    t.operatingPoints
      .filter((p) => p.gmMicrosiemens !== null && p.raKiloohms !== null && p.mu !== null)
      .map((p) => ({ type: t.designation, ...p })),
  );

  it('has the five rows of the reference sheet and more', () => {
    expect(rows.length).toBeGreaterThanOrEqual(5);
  });

  for (const r of rows) {
    it(`holds for ${r.type} at ${r.vaVolts} V, ${r.vg1Volts} V (${r.source})`, () => {
      const mu = muFromGmRa(r.gmMicrosiemens as number, r.raKiloohms as number);
      expect(Math.abs(mu / (r.mu as number) - 1)).toBeLessThan(0.02);
    });
  }
});
