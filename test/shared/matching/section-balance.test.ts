import { describe, expect, it } from 'vitest';
import { findPartners } from '../../../shared/matching/find-partners';
import { groupValves, type MatchResult } from '../../../shared/matching/group-valves';
import {
  resolveCriteria,
  type MatchingCriteria,
  type ResolvedCriteria,
} from '../../../shared/matching/matching-criteria';
import { matchValves } from '../../../shared/matching/match-valves';
import { sectionBalance } from '../../../shared/matching/section-balance';
import { extractFeatures, type ValveFeatures } from '../../../shared/matching/valve-features';
import {
  individual,
  PLAN_12AX7,
  publishedLaw,
  sampleFamily,
  surfaceValve,
  type PoolValve,
} from './valve-pool';

// Exact: Ia ∝ 1/KG1 in the Koren model (Glass Audio 8(5), 1996; published 12AX7 set), so a
// section 2 with KG1 scaled by f differs from section 1 by 200·(f - 1)/(f + 1) % everywhere.
const exactPercent = (f: number) => (200 * (f - 1)) / (f + 1);

const BASE: MatchingCriteria = {
  valveType: '12AX7',
  operatingPoints: [
    { label: 'idle', vaVolts: 250, vg1Volts: -2 },
    { label: 'drive', vaVolts: 150, vg1Volts: -1 },
  ],
  groupSize: 2,
};

function resolved(c: MatchingCriteria): ResolvedCriteria {
  const r = resolveCriteria(c);
  if (!r.ok) throw new Error(r.reason);
  return r.criteria;
}

/** A double triode: section 1 with emission e, section 2 with e·imbalance. */
function doubleTriode(id: string, e: number, imbalance: number): PoolValve {
  const base = publishedLaw('12AX7');
  return { id, law: individual(base, e), law2: individual(base, e * imbalance) };
}

function features(v: PoolValve, criteria: ResolvedCriteria): ValveFeatures {
  const f = extractFeatures(surfaceValve(v), criteria);
  if (!f.ok) throw new Error(f.reason);
  return f.features;
}

function ok(r: ReturnType<typeof groupValves>): MatchResult {
  if (!r.ok) throw new Error(r.reason);
  return r;
}

describe('section balance', () => {
  const criteria = resolved(BASE);

  it('is the difference of section 1 and section 2 Ia and gm in % of their mean', () => {
    const b = sectionBalance(features(doubleTriode('a', 1, 1.06), criteria), criteria)!;
    expect(b.points.map((p) => p.label)).toEqual(['idle', 'drive']);
    for (const p of b.points) {
      expect(p.iaPercent).toBeCloseTo(exactPercent(1.06), 9);
      expect(p.gmPercent).toBeCloseTo(exactPercent(1.06), 6);
    }
    expect(b.imbalancePercent).toBeCloseTo(exactPercent(1.06), 6);
    expect(
      sectionBalance(features({ id: 's', law: publishedLaw('12AX7') }, criteria), criteria),
    ).toBeNull();
  });

  it('agrees with the exact value within 0.5 % points on sampled, analysed families', () => {
    const law = publishedLaw('12AX7');
    const result = matchValves(
      [
        {
          id: 'a',
          label: 'a',
          family: sampleFamily(law, PLAN_12AX7, 1),
          section2Family: sampleFamily(individual(law, 1.06), PLAN_12AX7, 2),
        },
        {
          id: 'b',
          label: 'b',
          family: sampleFamily(law, PLAN_12AX7, 3),
          section2Family: sampleFamily(individual(law, 1.06), PLAN_12AX7, 4),
        },
      ],
      // The idle point only: there the curves on both sides cover Va for both sections, so the
      // analysis interpolates both the same way.
      { ...BASE, operatingPoints: [BASE.operatingPoints![0]], sections: 'both' },
    );
    expect(result.ok).toBe(true);
    const member = result.ok ? result.groups[0].members[0] : null;
    // Tolerance 0.5 % points: the analysis smooths and interpolates; gm carries its error.
    expect(member!.sectionImbalancePercent!).toBeGreaterThan(exactPercent(1.06) - 0.5);
    expect(member!.sectionImbalancePercent!).toBeLessThan(exactPercent(1.06) + 0.5);
  });

  it('as a filter, leaves out valves over the imbalance limit or without section 2', () => {
    const filtered = resolved({ ...BASE, maxSectionImbalancePercent: 5 });
    const pool = [
      features(doubleTriode('a', 1, 1.02), filtered),
      features(doubleTriode('b', 1.01, 1.03), filtered),
      features(doubleTriode('c', 1, 1.08), filtered),
      features({ id: 'd', law: publishedLaw('12AX7') }, filtered),
    ];
    const result = ok(groupValves(pool, filtered));
    expect(result.groups.map((g) => g.members.map((m) => m.id))).toEqual([['a', 'b']]);
    expect(result.leftOver.map((v) => [v.id, v.reason])).toEqual([
      ['c', 'section-imbalance'],
      ['d', 'no-second-section'],
    ]);
    expect(result.leftOver[0].detail).toBe(
      'its sections differ by 7.7 %, more than the 5 % allowed',
    );
    expect(result.groups[0].members[0].sectionImbalancePercent).toBeCloseTo(exactPercent(1.02), 6);
  });

  it('as a criterion, prefers balanced valves where the match alone cannot choose', () => {
    // a and b match the target t equally (same section 1); b is the better balanced valve.
    const weighted = resolved({ ...BASE, sectionBalanceWeight: 1 });
    const plain = resolved(BASE);
    const valves = [
      doubleTriode('t', 1, 1.0),
      doubleTriode('a', 1.02, 1.08),
      doubleTriode('b', 1.02, 1.01),
    ];
    const rank = (c: ResolvedCriteria) => {
      const fs = valves.map((v) => features(v, c));
      const r = findPartners(fs[0], fs, c);
      return r.ok ? r.partners.map((p) => p.id) : [];
    };
    expect(rank(plain)).toEqual(['a', 'b']);
    expect(rank(weighted)).toEqual(['b', 'a']);
    // Pairing the three: on the match alone a and b (equal section 1) pair and t is left over;
    // with the balance weighed, t pairs with the balanced b and the unbalanced a is left over.
    const leftOver = (c: ResolvedCriteria) =>
      ok(
        groupValves(
          valves.map((v) => features(v, c)),
          c,
        ),
      ).leftOver.map((v) => v.id);
    expect(leftOver(plain)).toEqual(['t']);
    expect(leftOver(weighted)).toEqual(['a']);
  });

  it('on both sections, compares section 1 with section 1 and section 2 with section 2', () => {
    const both = resolved({ ...BASE, sections: 'both' });
    // x and y agree on section 1 only; x and z agree on both sections.
    const pool = [
      doubleTriode('x', 1, 1.1),
      doubleTriode('y', 1, 1.0),
      doubleTriode('z', 1.005, 1.1),
      doubleTriode('w', 1.005, 1.0),
    ];
    const first = resolved(BASE);
    const pairs = (c: ResolvedCriteria) =>
      ok(
        groupValves(
          pool.map((v) => features(v, c)),
          c,
        ),
      ).groups.map((g) => g.members.map((m) => m.id));
    expect(pairs(both).sort()).toEqual([
      ['w', 'y'],
      ['x', 'z'],
    ]);
    const group = ok(
      groupValves(
        pool.map((v) => features(v, both)),
        both,
      ),
    ).groups[0];
    expect(group.points.map((p) => `${p.label} ${p.section}`)).toEqual([
      'idle 1',
      'drive 1',
      'idle 2',
      'drive 2',
    ]);
    // On section 1 alone x and y are identical, and so are z and w.
    expect(pairs(first).sort()).toEqual([
      ['w', 'z'],
      ['x', 'y'],
    ]);
  });
});
