import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { VALVE_TYPES } from '../../../shared/catalog/valve-types';
import { buildAnodeFamily } from '../../../shared/analysis/index';
import { readingEndsCurve } from '../../../shared/domain/plan-check';
import { anodeSteps, type SweepPlan, type SweepPoint } from '../../../shared/domain/sweep';
import { gradeForPercent } from '../../../shared/grading/grade-thresholds';
import { korenTriodeIa, type KorenTriodeParams } from '../../../shared/physics/koren';
import {
  connectBridge,
  eventually,
  smallTriodePlan,
  startTestHub,
  type TestHub,
} from '../test-hub';
import { clearDemoSweeps } from '../demo/clear-demo-sweeps';

type Bridge = Awaited<ReturnType<typeof connectBridge>>;

/** Koren's published 12AX7 set (Glass Audio 8(5), 1996), as the catalog carries it. */
const KOREN_12AX7 = VALVE_TYPES.find((t) => t.designation === '12AX7')!.model!
  .params as KorenTriodeParams;

/** A 12AX7 family that reaches the reference point (250 V, -2 V) with curves on both sides. */
const FAMILY_PLAN: SweepPlan = smallTriodePlan({
  vaStopVolts: 300,
  vaStepVolts: 10,
  // Half-volt steps: the curvature of the law between 1 V steps would cost gm several %.
  vg1Volts: [0, -0.5, -1, -1.5, -2, -2.5, -3, -3.5, -4],
});

/**
 * Readings of a valve that follows the Koren model exactly (no noise), as a tracer takes them:
 * each curve stops at the plan's current or dissipation limit; seqs count the readings.
 */
function korenFamily(plan: SweepPlan): SweepPoint[] {
  const points: SweepPoint[] = [];
  plan.vg1Volts.forEach((vg1, curve) => {
    for (const va of anodeSteps(plan)) {
      const ia = korenTriodeIa(KOREN_12AX7, va, vg1);
      points.push({
        seq: points.length,
        curve,
        vaVolts: va,
        vg1Volts: vg1,
        vg2Volts: 0,
        iaMilliamps: ia,
        ig2Milliamps: 0,
      });
      if (readingEndsCurve(plan, va, ia)) break;
    }
  });
  return points;
}

describe('sweeps on valve records', () => {
  let hub: TestHub;
  let bridge: Bridge;
  let tech: string;
  let admin: string;
  let viewer: string;
  let valveA: number;
  let valveB: number;
  let el34: number;

  beforeAll(async () => {
    hub = await startTestHub();
    // These tests assume stock without sweeps; the demo's sweeps are tested on their own.
    await clearDemoSweeps(hub);
    bridge = await connectBridge(hub, 0);
    [tech, admin, viewer] = await Promise.all([
      hub.token('tech'),
      hub.token('admin'),
      hub.token('viewer'),
    ]);
    const make = async (type: string) =>
      (await as(tech).post('/api/valves', { type }).expect(201)).body.id as number;
    valveA = await make('12AX7');
    valveB = await make('ECC83');
    el34 = await make('EL34');
  });
  afterAll(async () => {
    await bridge.close();
    await hub.close();
  });

  const as = (token: string) => ({
    get: (path: string) => hub.api.get(path).set('authorization', `Bearer ${token}`),
    post: (path: string, body: object) =>
      hub.api.post(path).set('authorization', `Bearer ${token}`).send(body),
  });

  /** Runs a sweep on bench A as its bridge would, sending `points`; returns its id. */
  async function runSweep(body: object, points: SweepPoint[] = []): Promise<number> {
    const res = await as(tech)
      .post('/api/sweeps', { benchId: 1, ...body })
      .expect(201);
    const id = res.body.id as number;
    bridge.send({ type: 'sweep-started', sweepId: id });
    if (points.length) bridge.send({ type: 'points', sweepId: id, points });
    bridge.send({
      type: 'sweep-ended',
      sweepId: id,
      reason: 'complete',
      count: points.length,
      message: '',
    });
    await eventually(async () => (await hub.services.sweeps.view(id)).status === 'complete', 'end');
    return id;
  }

  it('fills the valve type from the record and refuses another type', async () => {
    const res = await as(tech)
      .post('/api/sweeps', {
        benchId: 1,
        plan: smallTriodePlan(),
        valveId: el34,
        valveType: '12AX7',
      })
      .expect(422);
    expect(res.body.error).toMatchObject({ code: 'valve_type_mismatch' });
    expect(res.body.error.fields.valveType).toContain('EL34');
    const unknown = await as(tech)
      .post('/api/sweeps', { benchId: 1, plan: smallTriodePlan(), valveId: 99999 })
      .expect(400);
    expect(unknown.body.error.fields).toHaveProperty('valveId');
    const id = await runSweep({ plan: smallTriodePlan(), valveId: valveA, valveType: 'ecc83' });
    const view = await hub.services.sweeps.view(id);
    expect(view).toMatchObject({ valveId: valveA, valveType: '12AX7' });
    expect(view.valveLabel).toMatch(/^KL-\d{4}$/);
  });

  it("checks a record's sweep against its type's ratings, not the bench's alone", async () => {
    const res = await as(tech)
      .post('/api/sweeps', {
        benchId: 1,
        plan: smallTriodePlan({ vaStopVolts: 350 }),
        valveId: valveB,
      })
      .expect(422);
    expect(res.body.error.fields['plan.vaStopVolts']).toContain('12AX7 maximum ratings');
  });

  it('computes the figures at the reference point when the sweep ends, for the trend and grade', async () => {
    const points = korenFamily(FAMILY_PLAN);
    const id = await runSweep({ plan: FAMILY_PLAN, valveId: valveA }, points);
    // Stored in the background once every point is in; the list reads them from there.
    await eventually(
      async () =>
        (await hub.services.db
          .selectFrom('sweep_figures')
          .select('sweep_id')
          .where('sweep_id', '=', id)
          .executeTakeFirst()) !== undefined,
      'figures stored',
    );
    const detail = (await as(viewer).get(`/api/valves/${valveA}`).expect(200)).body;
    expect(detail.sweeps.map((s: { id: number }) => s.id)[0]).toBe(id);
    const last = detail.trend[detail.trend.length - 1];
    expect(last).toMatchObject({ sweepId: id, vaVolts: 250, vg1Volts: -2, refusal: null });
    // The record carries what the analysis module finds on the stored points, to 4 figures.
    const built = buildAnodeFamily(points);
    if (!built.ok) throw new Error(built.reason);
    const direct = built.family.operatingPoint(250, -2);
    if (!direct.ok) throw new Error(direct.reason);
    expect(last.iaMilliamps).toBe(Number(direct.iaMilliamps.value.toPrecision(4)));
    expect(last.gmMicrosiemens).toBe(Number(direct.gmMicrosiemens.value.toPrecision(4)));
    // Exact model values at the point: Ia from the law itself, gm by a central difference of it.
    const ia = korenTriodeIa(KOREN_12AX7, 250, -2);
    const h = 1e-4;
    const gm =
      ((korenTriodeIa(KOREN_12AX7, 250, -2 + h) - korenTriodeIa(KOREN_12AX7, 250, -2 - h)) /
        (2 * h)) *
      1000;
    // Interpolated on 10 V steps and 1 V grid steps: within 1 % (Ia) and 3 % (gm) of the law.
    expect(Math.abs(last.iaMilliamps - ia) / ia).toBeLessThan(0.01);
    expect(Math.abs(last.gmMicrosiemens - gm) / gm).toBeLessThan(0.03);
    // Nominal: 1.2 mA and 1600 µS (RCA data sheet).
    expect(last.iaPercent).toBeCloseTo((100 * last.iaMilliamps) / 1.2, 1);
    expect(last.gmPercent).toBeCloseTo((100 * last.gmMicrosiemens) / 1600, 1);
    // Graded on gm (Ia is shown, not graded): the published model's Ia is 79 % of the data
    // sheet's here, its gm 104 %; thresholds 80 / 65 % are the common-practice defaults.
    expect(detail.percentOfNominal).toBeCloseTo(last.gmPercent, 1);
    expect(detail.gradeSource).toBe('sweep');
    expect(detail.grade).toBe(
      gradeForPercent(last.gmPercent, { strongMinPercent: 80, fairMinPercent: 65 }),
    );
    expect(detail.grade).toBe('strong');
    // The short sweep before it covers no reference point: in the trend, with the reason.
    expect(detail.trend[0].refusal).toEqual(expect.any(String));
    expect(detail.trend[0].iaMilliamps).toBeNull();
    // The 12AX7's curves reach 250 V on both sides of -2 V: nothing was carried on.
    expect(last.extendedVolts).toBe(0);

    // Figures stored before cut curves were carried on (extended_volts null) are computed again.
    await hub.services.db
      .updateTable('sweep_figures')
      .set({ extended_volts: null, computed_at: '2000-01-01T00:00:00.000Z' })
      .where('sweep_id', '=', id)
      .execute();
    await as(viewer).get(`/api/valves/${valveA}`).expect(200);
    const again = await hub.services.db
      .selectFrom('sweep_figures')
      .select(['extended_volts', 'computed_at'])
      .where('sweep_id', '=', id)
      .executeTakeFirstOrThrow();
    expect(again.extended_volts).toBe(0);
    expect(again.computed_at > '2000-01-01T00:00:00.000Z').toBe(true);
  });

  it('grades by the thresholds in force, in the list and its filter', async () => {
    const graded = await as(viewer).get(`/api/valves/${valveA}`).expect(200);
    const percent = graded.body.percentOfNominal as number;
    await hub.api
      .put('/api/settings')
      .set('authorization', `Bearer ${admin}`)
      .send({ gradeThresholds: { strongMinPercent: percent + 10, fairMinPercent: percent + 5 } })
      .expect(200);
    const weak = await as(viewer).get('/api/valves?grade=weak&pageSize=100').expect(200);
    expect(weak.body.items.map((v: { id: number }) => v.id)).toEqual([valveA]);
    await hub.api
      .put('/api/settings')
      .set('authorization', `Bearer ${admin}`)
      .send({ gradeThresholds: { strongMinPercent: percent - 1, fairMinPercent: percent - 5 } })
      .expect(200);
    const strong = await as(viewer).get('/api/valves?grade=strong').expect(200);
    expect(strong.body.items.map((v: { id: number }) => v.id)).toEqual([valveA]);
    const byGrade = await as(viewer)
      .get('/api/valves?sort=grade&order=desc&pageSize=1')
      .expect(200);
    expect(byGrade.body.items[0].id).toBe(valveA);
  });

  it('attaches a finished sweep, moves it to another record, and audits from and to', async () => {
    const id = await runSweep({ plan: smallTriodePlan(), valveType: '12AX7', valveLabel: 'loose' });
    const on = await as(tech).post(`/api/sweeps/${id}/attach`, { valveId: valveA }).expect(200);
    expect(on.body.valveId).toBe(valveA);
    const moved = await as(tech).post(`/api/sweeps/${id}/attach`, { valveId: valveB }).expect(200);
    expect(moved.body.valveId).toBe(valveB);
    const ofB = await as(viewer).get(`/api/sweeps?valveId=${valveB}`).expect(200);
    expect(ofB.body.items.map((s: { id: number }) => s.id)).toEqual([id]);
    const ofA = await as(viewer).get(`/api/sweeps?valveId=${valveA}&pageSize=100`).expect(200);
    expect(ofA.body.items.map((s: { id: number }) => s.id)).not.toContain(id);

    const audit = await as(admin).get('/api/audit?action=sweep.attach&pageSize=2').expect(200);
    const [second, first] = audit.body.items;
    expect(first).toMatchObject({
      username: 'tech',
      subject: `sweep:${id}`,
      detail: { from: null, to: { valveId: valveA } },
    });
    expect(second.detail).toMatchObject({ from: { valveId: valveA }, to: { valveId: valveB } });

    const off = await as(tech).post(`/api/sweeps/${id}/attach`, { valveId: null }).expect(200);
    expect(off.body.valveId).toBeNull();
  });

  it('refuses to attach to a record of another type, a running sweep, or for a viewer', async () => {
    const id = await runSweep({ plan: smallTriodePlan(), valveType: '12AX7' });
    const other = await as(tech).post(`/api/sweeps/${id}/attach`, { valveId: el34 }).expect(422);
    expect(other.body.error.code).toBe('valve_type_mismatch');
    await as(viewer).post(`/api/sweeps/${id}/attach`, { valveId: valveA }).expect(403);
    await as(tech).post(`/api/sweeps/${id}/attach`, { valveId: 99999 }).expect(404);

    const running = await as(tech)
      .post('/api/sweeps', { benchId: 1, plan: smallTriodePlan() })
      .expect(201);
    const busy = await as(tech)
      .post(`/api/sweeps/${running.body.id}/attach`, { valveId: valveA })
      .expect(409);
    expect(busy.body.error.code).toBe('sweep_not_ended');
    bridge.send({
      type: 'sweep-ended',
      sweepId: running.body.id,
      reason: 'complete',
      count: 0,
      message: '',
    });
    await eventually(
      async () => (await hub.services.sweeps.view(running.body.id)).status === 'complete',
      'end',
    );
  });

  it('keeps the sweeps of a deleted record, taken off it', async () => {
    const doomed = (await as(tech).post('/api/valves', { type: '12AX7' }).expect(201)).body.id;
    const id = await runSweep({ plan: smallTriodePlan(), valveId: doomed });
    await hub.api
      .delete(`/api/valves/${doomed}`)
      .set('authorization', `Bearer ${admin}`)
      .expect(204);
    const view = await hub.services.sweeps.view(id);
    expect(view.valveId).toBeNull();
    expect(view.valveLabel).toMatch(/^KL-/);
  });
});
