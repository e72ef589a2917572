import { describe, expect, it } from 'vitest';
import { findValveType } from '../../shared/catalog/valve-types';
import { SimulatedValve } from '../../simulator/simulated-valve';

const SEEDS = Array.from({ length: 200 }, (_, i) => i + 1);

/** Anode current of section `s` at the type's first data-sheet operating point, mA. */
function iaAtOperatingPoint(v: SimulatedValve, s = 0): number {
  const op = v.type.operatingPoints[0];
  return v.currents(s, op.vaVolts, op.vg1Volts, op.vg2Volts ?? 0).iaMilliamps;
}

describe('SimulatedValve', () => {
  it('gives the same valve for the same seed, every time', () => {
    const a = SimulatedValve.fromSpec('12AX7#7');
    const b = SimulatedValve.fromSpec('12AX7#7');
    expect(b.sections).toEqual(a.sections);
    expect(iaAtOperatingPoint(b)).toBe(iaAtOperatingPoint(a));
  });

  it('gives different valves for different seeds of one type', () => {
    const currents = SEEDS.map((seed) =>
      iaAtOperatingPoint(SimulatedValve.fromSpec({ typeName: '12AX7', seed })),
    );
    expect(new Set(currents).size).toBe(SEEDS.length);
    const one = iaAtOperatingPoint(SimulatedValve.fromSpec('12AX7#1'));
    const two = iaAtOperatingPoint(SimulatedValve.fromSpec('12AX7#2'));
    expect(Math.abs(one - two) / one).toBeGreaterThan(0.01);
  });

  it('seed 0 is the nominal valve with the published Koren parameters', () => {
    const v = SimulatedValve.fromSpec('EL34#0');
    const published = findValveType('EL34')!.model!.params;
    expect(v.sections[0].params).toEqual(published);
  });

  it('spreads current by roughly +-20-30 % and mu by a few % across individuals', () => {
    // Common practice (no single source): new valves spread roughly +-20-30 % around the
    // data sheet in current; mu is set by the geometry and varies little.
    const nominal = SimulatedValve.fromSpec('12AX7#0');
    const ratios = SEEDS.map(
      (seed) =>
        iaAtOperatingPoint(SimulatedValve.fromSpec({ typeName: '12AX7', seed })) /
        iaAtOperatingPoint(nominal),
    );
    const mus = SEEDS.map(
      (seed) => SimulatedValve.fromSpec({ typeName: '12AX7', seed }).sections[0].params.mu,
    );
    expect(Math.min(...ratios)).toBeGreaterThan(0.55);
    expect(Math.max(...ratios)).toBeLessThan(1.6);
    expect(ratios.filter((r) => Math.abs(r - 1) > 0.1).length).toBeGreaterThan(SEEDS.length * 0.2);
    expect(Math.min(...mus)).toBeGreaterThanOrEqual(96);
    expect(Math.max(...mus)).toBeLessThanOrEqual(104);
  });

  it('gives the two sections of a double triode slightly different currents', () => {
    const imbalance = SEEDS.map((seed) => {
      const v = SimulatedValve.fromSpec({ typeName: '12AU7', seed });
      return iaAtOperatingPoint(v, 1) / iaAtOperatingPoint(v, 0) - 1;
    });
    expect(imbalance.every((x) => x !== 0)).toBe(true);
    expect(Math.max(...imbalance.map(Math.abs))).toBeLessThan(0.15);
    expect(SimulatedValve.fromSpec('EL34#3').sections.length).toBe(1);
  });

  it('measures screen current only for pentodes', () => {
    const pentode = SimulatedValve.fromSpec('6L6GC#2');
    expect(pentode.hasScreen).toBe(true);
    expect(pentode.currents(0, 350, -18, 250).ig2Milliamps).toBeGreaterThan(0);
    expect(SimulatedValve.fromSpec('300B#2').currents(0, 300, -61, 0).ig2Milliamps).toBe(0);
  });

  it('refuses types without a published model and malformed specs, saying why', () => {
    expect(() => SimulatedValve.fromSpec('EL84#1')).toThrow(/no published model/);
    expect(() => SimulatedValve.fromSpec('XYZ9#1')).toThrow(/unknown valve type/);
    expect(() => SimulatedValve.fromSpec('12AX7')).toThrow(/TYPE#SEED/);
    expect(SimulatedValve.fromSpec('ecc83#4').label).toBe('12AX7#4');
  });
});
