import { describe, expect, it } from 'vitest';
import { relativeDifferencePercent } from '../../../shared/matching/compare-readings';
import { groupSpread } from '../../../shared/matching/group-spread';
import {
  resolveCriteria,
  type MatchingCriteria,
  type ResolvedCriteria,
} from '../../../shared/matching/matching-criteria';
import { METRIC_DESCRIPTION } from '../../../shared/matching/metric-description';
import { extractFeatures, type ValveFeatures } from '../../../shared/matching/valve-features';
import { distanceMatrix, valveDistance } from '../../../shared/matching/valve-distance';
import { individual, publishedLaw, surfaceValve, type ValveLaw } from './valve-pool';

// Exact checks: in the Koren model Ia is proportional to 1/KG1 at every (Va, Vg1), so two
// valves whose KG1 differ by a factor f differ in Ia and gm by 200·(f - 1)/(f + 1) % of their
// mean everywhere (Koren, Glass Audio 8(5), 1996; published 12AX7 and EL34 sets as catalogued).
const exactPercent = (f: number) => (200 * (f - 1)) / (f + 1);

const TRIODE: MatchingCriteria = {
  valveType: '12AX7',
  operatingPoints: [
    { label: 'idle', vaVolts: 250, vg1Volts: -2 },
    { label: 'drive', vaVolts: 150, vg1Volts: -1 },
  ],
  window: { vaMinVolts: 100, vaMaxVolts: 300, iaMinMilliamps: 0.2, iaMaxMilliamps: 3 },
  groupSize: 2,
};

function resolved(c: MatchingCriteria): ResolvedCriteria {
  const r = resolveCriteria(c);
  if (!r.ok) throw new Error(r.reason);
  return r.criteria;
}

function features(id: string, law: ValveLaw, criteria: ResolvedCriteria): ValveFeatures {
  const f = extractFeatures(surfaceValve({ id, law }), criteria);
  if (!f.ok) throw new Error(f.reason);
  return f.features;
}

describe('valve distance', () => {
  const criteria = resolved(TRIODE);
  const base = publishedLaw('12AX7');

  it('is exactly 200·(f - 1)/(f + 1) % for valves whose emission differs by a factor f', () => {
    for (const f of [1.01, 1.05, 1.2]) {
      const a = features('a', base, criteria);
      const b = features('b', individual(base, f), criteria);
      const d = valveDistance(a, b, criteria);
      for (const p of d.points) {
        expect(p.iaPercent).toBeCloseTo(exactPercent(f), 9);
        expect(p.gmPercent).toBeCloseTo(exactPercent(f), 6);
      }
      expect(d.curvePercent).toBeCloseTo(exactPercent(f), 9);
      expect(d.distancePercent).toBeCloseTo(exactPercent(f), 6);
    }
  });

  it('weighs the mean Ia, mean gm and curve differences with the weights given', () => {
    // A change in MU moves Ia and gm by different amounts, so the weights show.
    const a = features('a', base, criteria);
    const b = features('b', individual(base, 1, 1.03), criteria);
    const d = valveDistance(a, b, criteria);
    const meanIa = (d.points[0].iaPercent! + d.points[1].iaPercent!) / 2;
    const meanGm = (d.points[0].gmPercent + d.points[1].gmPercent) / 2;
    const weighted = resolved({ ...TRIODE, iaWeight: 3, gmWeight: 1, curveWeight: 0.5 });
    const dw = valveDistance(a, b, weighted);
    expect(dw.distancePercent).toBeCloseTo((3 * meanIa + meanGm + 0.5 * d.curvePercent!) / 4.5, 9);
    expect(d.distancePercent).toBeCloseTo((meanIa + meanGm + d.curvePercent!) / 3, 9);
    expect(meanIa).not.toBeCloseTo(meanGm, 1);
    const onlyGm = resolved({ ...TRIODE, iaWeight: 0, curveWeight: 0 });
    expect(valveDistance(a, b, onlyGm).distancePercent).toBeCloseTo(meanGm, 9);
  });

  it('is zero for identical valves and the same both ways', () => {
    const a = features('a', base, criteria);
    const b = features('b', individual(base, 1.07, 0.98), criteria);
    expect(valveDistance(a, a, criteria).distancePercent).toBe(0);
    expect(valveDistance(a, b, criteria).distancePercent).toBe(
      valveDistance(b, a, criteria).distancePercent,
    );
    const m = distanceMatrix([a, b], criteria);
    expect(m.at(0, 1)).toBeCloseTo(valveDistance(a, b, criteria).distancePercent, 12);
  });

  it('counts only window nodes where the pair mean current lies inside the window', () => {
    const a = features('a', base, criteria);
    const b = features('b', individual(base, 1.05), criteria);
    const w = criteria.window!;
    let expected = 0;
    for (let k = 0; k < a.section1.windowIaMilliamps.length; k++) {
      const mean = (a.section1.windowIaMilliamps[k] + b.section1.windowIaMilliamps[k]) / 2;
      if (mean >= w.iaMinMilliamps && mean <= w.iaMaxMilliamps) expected++;
    }
    const d = valveDistance(a, b, criteria);
    expect(d.curveNodes).toBe(expected);
    expect(expected).toBeGreaterThan(10);
    expect(expected).toBeLessThan(w.vaVolts.length * w.vg1Volts.length);
  });

  it('compares only gm at an equal-current point and reports the bias difference', () => {
    const equal = resolved({
      valveType: '12AX7',
      operatingPoints: [{ label: 'at 1 mA', vaVolts: 250, iaMilliamps: 1 }],
      groupSize: 2,
    });
    const a = features('a', base, equal);
    const b = features('b', individual(base, 1.1), equal);
    const d = valveDistance(a, b, equal);
    expect(d.points[0].iaPercent).toBeNull();
    expect(a.section1.points[0].iaMilliamps).toBeCloseTo(1, 9);
    expect(b.section1.points[0].iaMilliamps).toBeCloseTo(1, 9);
    expect(d.points[0].vg1Volts).toBeGreaterThan(0.01);
    expect(d.distancePercent).toBeCloseTo(d.points[0].gmPercent, 12);
    // At equal Ia a weaker valve runs at a less negative grid: gm then differs less than Ia did.
    expect(d.points[0].gmPercent).toBeLessThan(exactPercent(1.1));
  });

  it('gives a pair the spreads its distance is made of', () => {
    const a = features('a', base, criteria);
    const b = features('b', individual(base, 1.04, 1.01), criteria);
    const d = valveDistance(a, b, criteria);
    const s = groupSpread([a, b], criteria);
    s.points.forEach((p, i) => {
      // Each spread names where it was taken, for reports.
      expect(p.vaVolts).toBe(criteria.points[i].vaVolts);
      expect(p.vg2Volts).toBe(criteria.points[i].vg2Volts);
      expect(p.iaSpreadPercent).toBeCloseTo(d.points[i].iaPercent!, 9);
      expect(p.gmSpreadPercent).toBeCloseTo(d.points[i].gmPercent, 9);
    });
    expect(s.curveSpreadPercent).toBeCloseTo(d.curvePercent!, 9);
  });

  it('judges a group acceptable only when every weighed spread is within the tolerance', () => {
    const a = features('a', base, criteria);
    const near = features('b', individual(base, 1.04), criteria);
    expect(groupSpread([a, near], criteria)).toMatchObject({ acceptable: true, exceeds: [] });
    const tight = resolved({ ...TRIODE, tolerancePercent: 3 });
    const verdict = groupSpread([a, near], tight);
    expect(verdict.acceptable).toBe(false);
    expect(verdict.exceeds).toContain('Ia at idle: 3.9 % (tolerance 3 %)');
    // With Ia and the curves not weighed, only gm counts.
    const gmOnly = resolved({ ...TRIODE, tolerancePercent: 3, iaWeight: 0, curveWeight: 0 });
    expect(groupSpread([a, near], gmOnly).exceeds.every((e) => e.startsWith('gm'))).toBe(true);
  });

  it('measures a difference in % of the mean, and 0 between two zeros', () => {
    expect(relativeDifferencePercent(1.05, 0.95)).toBeCloseTo(10, 12);
    expect(relativeDifferencePercent(0, 0)).toBe(0);
    expect(relativeDifferencePercent(2, 0)).toBe(200);
  });

  it('is described to the user in one paragraph that names its parts', () => {
    expect(METRIC_DESCRIPTION).not.toContain('\n');
    for (const word of ['Ia', 'gm', 'window', 'weight', 'tolerance', 'largest distance']) {
      expect(METRIC_DESCRIPTION).toContain(word);
    }
  });
});

describe('pentode distance', () => {
  it('is exact for EL34 valves differing in emission, at points at the family Vg2', () => {
    const criteria = resolved({
      valveType: 'EL34',
      operatingPoints: [{ label: 'idle', vaVolts: 250, vg2Volts: 250, vg1Volts: -17.5 }],
      window: { vaMinVolts: 50, vaMaxVolts: 250, iaMinMilliamps: 20, iaMaxMilliamps: 150 },
      groupSize: 2,
    });
    const base = publishedLaw('EL34', 250);
    const a = features('a', base, criteria);
    const b = features('b', individual(base, 1.06), criteria);
    expect(valveDistance(a, b, criteria).distancePercent).toBeCloseTo(exactPercent(1.06), 6);
    const at200 = extractFeatures(
      surfaceValve({ id: 'c', law: publishedLaw('EL34', 200) }),
      criteria,
    );
    expect(at200).toMatchObject({ ok: false, kind: 'no-data' });
  });
});
