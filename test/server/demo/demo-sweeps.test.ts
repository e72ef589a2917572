import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { findValveType } from '../../../shared/catalog/valve-types';
import { readingEndsCurve, readingTrips } from '../../../shared/domain/plan-check';
import { sectionOf, type SweepPlan } from '../../../shared/domain/sweep';
import { DEMO_BENCHES } from '../../../server/demo/demo-data';
import { DEMO_STOCK } from '../../../server/demo/demo-stock';
import { demoSweepPoints } from '../../../server/demo/demo-sweep-points';
import { listPoints } from '../../../server/sweeps/sweep.repository';
import { startTestHub, type TestHub } from '../test-hub';

const modelled = DEMO_STOCK.filter((v) => findValveType(v.type)?.model);

describe('demo sweeps', () => {
  let hub: TestHub;
  let viewer: string;
  let tech: string;

  beforeAll(async () => {
    hub = await startTestHub();
    [viewer, tech] = await Promise.all([hub.token('viewer'), hub.token('tech')]);
  });
  afterAll(() => hub.close());

  const sweeps = () =>
    hub.services.db
      .selectFrom('sweeps')
      .innerJoin('valves', 'valves.id', 'sweeps.valve_id')
      .innerJoin('benches', 'benches.id', 'sweeps.bench_id')
      .innerJoin('users', 'users.id', 'sweeps.operator_id')
      .select([
        'sweeps.id',
        'sweeps.status',
        'sweeps.plan_json',
        'sweeps.point_count',
        'sweeps.reported_count',
        'sweeps.started_at',
        'valves.label',
        'benches.name as bench',
        'users.username as operator',
      ])
      .execute();

  it('gives every demo valve of a modelled type a complete sweep of each section on the first bench', async () => {
    const rows = await sweeps();
    expect(modelled.length).toBeGreaterThan(0);
    const sectionsOf = (type: string) => findValveType(type)!.sections;
    const expected = modelled.flatMap((v) => Array(sectionsOf(v.type)).fill(v.label) as string[]);
    expect(rows.map((r) => r.label).sort()).toEqual(expected.sort());
    for (const v of modelled.filter((x) => sectionsOf(x.type) === 2)) {
      const own = rows.filter((r) => r.label === v.label);
      const sections = own.map((r) => sectionOf(JSON.parse(r.plan_json) as SweepPlan)).sort();
      expect(sections, v.label).toEqual([1, 2]);
    }
    // The record lists both sweeps; its trend and grade follow section 1.
    const twin = modelled.find((v) => sectionsOf(v.type) === 2)!;
    const found = await hub.api
      .get(`/api/valves?q=${twin.label}`)
      .set('authorization', `Bearer ${viewer}`)
      .expect(200);
    const detail = await hub.api
      .get(`/api/valves/${found.body.items[0].id}`)
      .set('authorization', `Bearer ${viewer}`)
      .expect(200);
    expect(detail.body.sweeps).toHaveLength(2);
    expect(detail.body.trend).toHaveLength(1);
    expect(detail.body.trend[0].sweepId).toBe(
      detail.body.sweeps.find((s: { plan: SweepPlan }) => sectionOf(s.plan) === 1).id,
    );
    for (const r of rows) {
      expect(r).toMatchObject({
        status: 'complete',
        bench: DEMO_BENCHES[0].name,
        operator: 'tech',
      });
      expect(Date.parse(r.started_at!)).toBeLessThan(Date.now());
    }
    const days = new Set(rows.map((r) => r.started_at!.slice(0, 10)));
    expect(days.size).toBeGreaterThan(rows.length / 2);
  });

  it('stores as many points as each sweep reports, with contiguous seqs', async () => {
    for (const r of await sweeps()) {
      const points = await listPoints(hub.services.db, r.id);
      expect(points.length).toBeGreaterThan(0);
      expect(r.point_count).toBe(points.length);
      expect(r.reported_count).toBe(points.length);
      expect(points.map((p) => p.seq)).toEqual(points.map((_, i) => i));
    }
  });

  it('ends each curve at the first reading on the plan limits and never trips', async () => {
    for (const r of await sweeps()) {
      const plan = JSON.parse(r.plan_json) as SweepPlan;
      const points = await listPoints(hub.services.db, r.id);
      for (let curve = 0; curve < plan.vg1Volts.length; curve++) {
        const on = points.filter((p) => p.curve === curve);
        expect(on.length).toBeGreaterThan(0);
        expect(on.every((p) => p.vg1Volts === plan.vg1Volts[curve])).toBe(true);
        const ends = on.map((p) => readingEndsCurve(plan, p.vaVolts, p.iaMilliamps));
        expect(ends.slice(0, -1)).not.toContain(true);
        if (!ends.at(-1)) expect(on.at(-1)!.vaVolts).toBe(plan.vaStopVolts);
      }
      expect(points.some((p) => readingTrips(plan, p.vaVolts, p.iaMilliamps))).toBe(false);
    }
  });

  it('grades every demo valve whose reference point its sweep covers, and says why not', async () => {
    const res = await hub.api
      .get('/api/valves?pageSize=100')
      .set('authorization', `Bearer ${viewer}`)
      .expect(200);
    const items = res.body.items as { label: string; type: string; grade: string | null }[];
    const twin = items.filter((v) => v.type === '12AX7');
    expect(twin.length).toBe(DEMO_STOCK.filter((v) => v.type === '12AX7').length);
    expect(twin.every((v) => v.grade !== null)).toBe(true);
    const figures = await hub.services.db
      .selectFrom('sweep_figures')
      .select(['refusal', 'ia_percent'])
      .execute();
    expect(figures).toHaveLength(modelled.reduce((n, v) => n + findValveType(v.type)!.sections, 0));
    for (const f of figures) {
      if (f.ia_percent === null) expect(f.refusal).toMatch(/above the measured range/);
    }
  });

  it('finds matched 12AX7 pairs among the demo stock', async () => {
    const statuses = ['in-stock', 'reserved', 'on-test'];
    const run = async (body: object) =>
      (
        await hub.api
          .post('/api/matching/runs')
          .set('authorization', `Bearer ${tech}`)
          .send({ statuses, ...body })
          .expect(201)
      ).body as { groups: { acceptable: boolean; members: { label: string }[] }[] };
    const pairs = await run({ valveType: '12AX7', groupSize: 2 });
    expect(pairs.groups.filter((g) => g.acceptable).length).toBeGreaterThanOrEqual(2);
    // Both sections of each double triode were swept: matching on both, each against its own.
    const both = await run({ valveType: '12AX7', groupSize: 2, sections: 'both' });
    expect(both.groups.length).toBeGreaterThanOrEqual(2);
  });

  it('simulates two demo valves of one type as different individuals', () => {
    const a = demoSweepPoints('12AX7#1').points;
    const b = demoSweepPoints('12AX7#2').points;
    expect(a.map((p) => p.iaMilliamps)).not.toEqual(b.map((p) => p.iaMilliamps));
    expect(demoSweepPoints('12AX7#1').points).toEqual(a);
  });
});
