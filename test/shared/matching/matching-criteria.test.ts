import { describe, expect, it } from 'vitest';
import {
  DEFAULT_TOLERANCE_PERCENT,
  MATCH_TOLERANCES,
} from '../../../shared/matching/match-tolerances';
import { resolveCriteria } from '../../../shared/matching/matching-criteria';

describe('matching criteria', () => {
  it('uses the common-practice tolerances: 5 % usual, 2-3 % tight, 10 % loose', () => {
    // Common practice, no single source (team reference sheet §6).
    expect(MATCH_TOLERANCES.usualPercent).toBe(5);
    expect(MATCH_TOLERANCES.tightPercent).toBeGreaterThanOrEqual(2);
    expect(MATCH_TOLERANCES.tightPercent).toBeLessThanOrEqual(3);
    expect(MATCH_TOLERANCES.loosePercent).toBe(10);
    const r = resolveCriteria({ valveType: '12AX7', groupSize: 2 });
    expect(r.ok && r.criteria.tolerancePercent).toBe(DEFAULT_TOLERANCE_PERCENT);
  });

  it('falls back to the type first typical point from the catalogue when no point is given', () => {
    // 12AX7 at 250 V, -2 V: RCA data sheet, as catalogued; EL34 at 250 V, 250 V, -13.5 V.
    const r = resolveCriteria({ valveType: 'ECC83', groupSize: 2 });
    expect(r.ok && r.criteria.points).toEqual([
      {
        label: 'typical',
        vaVolts: 250,
        vg2Volts: null,
        kind: 'fixed-bias',
        vg1Volts: -2,
        iaMilliamps: NaN,
      },
    ]);
    const p = resolveCriteria({ valveType: 'EL34', groupSize: 4 });
    expect(p.ok && p.criteria.points[0]).toMatchObject({
      vaVolts: 250,
      vg2Volts: 250,
      vg1Volts: -13.5,
    });
  });

  it('takes the window grid voltages from the type default plan unless given', () => {
    const r = resolveCriteria({
      valveType: '12AX7',
      window: {
        vaMinVolts: 100,
        vaMaxVolts: 300,
        iaMinMilliamps: 0.2,
        iaMaxMilliamps: 3,
        vaSteps: 5,
      },
      groupSize: 2,
    });
    expect(r.ok && r.criteria.window).toEqual({
      vaVolts: [100, 150, 200, 250, 300],
      vg1Volts: [0, -0.5, -1, -1.5, -2, -2.5, -3, -3.5, -4],
      iaMinMilliamps: 0.2,
      iaMaxMilliamps: 3,
    });
    // A window alone is enough: no point, so only the curves count.
    expect(r.ok && [r.criteria.points.length, r.criteria.iaWeight, r.criteria.gmWeight]).toEqual([
      0, 0, 0,
    ]);
  });

  it('refuses what cannot be matched, saying what to fix', () => {
    const reason = (c: Parameters<typeof resolveCriteria>[0]) => {
      const r = resolveCriteria(c);
      return r.ok ? null : r.reason;
    };
    expect(reason({ valveType: '12AX7', groupSize: 1 })).toBe(
      'group size must be a whole number of 2 or more; got 1',
    );
    expect(
      reason({
        valveType: 'EL34',
        operatingPoints: [{ label: 'idle', vaVolts: 250, vg1Volts: -13.5 }],
        groupSize: 2,
      }),
    ).toBe('idle: EL34 has a screen grid, so the point needs Vg2');
    expect(
      reason({
        valveType: '12AX7',
        operatingPoints: [{ vaVolts: 250, vg1Volts: -2, vg2Volts: 100 }],
        groupSize: 2,
      }),
    ).toBe('point 1: 12AX7 has no screen grid, so the point takes no Vg2');
    expect(reason({ valveType: 'XYZ1', groupSize: 2 })).toBe(
      'XYZ1 is not in the catalogue: give the operating points or a window to match at',
    );
    expect(
      reason({
        valveType: 'XYZ1',
        window: { vaMinVolts: 0, vaMaxVolts: 100, iaMinMilliamps: 1, iaMaxMilliamps: 5 },
        groupSize: 2,
      }),
    ).toBe('window: XYZ1 is not in the catalogue, so give the grid voltages to compare');
    expect(reason({ valveType: '12AX7', iaWeight: 0, gmWeight: 0, groupSize: 2 })).toBe(
      'at least one of the Ia, gm and curve weights must be above 0',
    );
    expect(reason({ valveType: 'EL34', sections: 'both', groupSize: 2 })).toBe(
      'EL34 has one section: section matching and balance do not apply',
    );
    expect(reason({ valveType: '12AX7', tolerancePercent: 0, groupSize: 2 })).toBe(
      'the tolerance must be above 0 %; got 0',
    );
    expect(
      reason({
        valveType: '12AX7',
        operatingPoints: [{ vaVolts: 250, vg1Volts: -2, iaMilliamps: 1 } as never],
        groupSize: 2,
      }),
    ).toBe('point 1: give either Vg1 (fixed bias) or Ia (equal current), not both');
  });

  it('drops the Ia weight when every point is at equal current', () => {
    const r = resolveCriteria({
      valveType: '12AX7',
      operatingPoints: [{ vaVolts: 250, iaMilliamps: 1.2 }],
      groupSize: 2,
    });
    expect(r.ok && [r.criteria.iaWeight, r.criteria.gmWeight, r.criteria.points[0].kind]).toEqual([
      0,
      1,
      'equal-current',
    ]);
  });
});
