import { describe, expect, it } from 'vitest';
import { findPartners } from '../../../shared/matching/find-partners';
import { resolveCriteria, type ResolvedCriteria } from '../../../shared/matching/matching-criteria';
import { extractFeatures, type ValveFeatures } from '../../../shared/matching/valve-features';
import { individual, publishedLaw, surfaceValve, type ValveLaw } from './valve-pool';

// Exact: Ia ∝ 1/KG1 in the Koren model (Glass Audio 8(5), 1996; published EL34 set), so an
// emission factor f puts a valve 200·(f - 1)/(f + 1) % from the base valve.
const exactPercent = (f: number) => (200 * (f - 1)) / (f + 1);

function criteria(): ResolvedCriteria {
  const r = resolveCriteria({
    valveType: 'EL34',
    operatingPoints: [
      { label: 'idle', vaVolts: 250, vg2Volts: 250, vg1Volts: -17.5 },
      { label: 'drive', vaVolts: 100, vg2Volts: 250, vg1Volts: -10 },
    ],
    groupSize: 2,
  });
  if (!r.ok) throw new Error(r.reason);
  return r.criteria;
}

function valve(id: string, law: ValveLaw, c: ResolvedCriteria): ValveFeatures {
  const f = extractFeatures(surfaceValve({ id, law }), c);
  if (!f.ok) throw new Error(f.reason);
  return f.features;
}

function partners(...args: Parameters<typeof findPartners>) {
  const r = findPartners(...args);
  if (!r.ok) throw new Error(r.reason);
  return r.partners;
}

describe('finding a partner', () => {
  const c = criteria();
  const base = publishedLaw('EL34');
  const target = valve('t', base, c);
  const factors: [string, number][] = [
    ['p5', 1.05],
    ['p1b', 1.01],
    ['p3', 0.97],
    ['p1a', 1.01],
    ['p20', 1.2],
  ];
  const pool = [target, ...factors.map(([id, f]) => valve(id, individual(base, f), c))];

  it('ranks the pool by distance, nearest first, ties by id, leaving the valve out', () => {
    const ranked = partners(target, pool, c);
    expect(ranked.map((p) => p.id)).toEqual(['p1a', 'p1b', 'p3', 'p5', 'p20']);
    expect(ranked[0].distance.distancePercent).toBeCloseTo(exactPercent(1.01), 6);
    expect(ranked[2].distance.distancePercent).toBeCloseTo(exactPercent(1 / 0.97), 6);
    expect(ranked[4].distance.distancePercent).toBeCloseTo(exactPercent(1.2), 6);
  });

  it('says which candidates make an acceptable pair under the tolerance, and why not', () => {
    const ranked = partners(target, pool, c);
    expect(ranked.map((p) => p.withinTolerance)).toEqual([true, true, true, true, false]);
    expect(ranked[4].exceeds).toContain('Ia at idle: 18.2 % (tolerance 5 %)');
  });

  it('returns at most the number asked for, and nothing from an empty pool', () => {
    expect(partners(target, pool, c, 2).map((p) => p.id)).toEqual(['p1a', 'p1b']);
    expect(partners(target, [], c)).toEqual([]);
    expect(partners(target, [target], c)).toEqual([]);
  });

  it('refuses a valve the criteria rule out, saying why', () => {
    const r = resolveCriteria({
      valveType: '12AX7',
      operatingPoints: [{ vaVolts: 250, vg1Volts: -2 }],
      sections: 'both',
      groupSize: 2,
    });
    if (!r.ok) throw new Error(r.reason);
    const single = valve('s', publishedLaw('12AX7'), r.criteria);
    expect(findPartners(single, [single], r.criteria)).toEqual({
      ok: false,
      reason: 'Valve s cannot be matched: section 2 was not measured, and the criteria need it',
    });
  });
});
