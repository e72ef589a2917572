import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CSV_HEADER } from '../../../server/sweeps/sweep-export';
import {
  connectBridge,
  eventually,
  makePoints,
  smallTriodePlan,
  startTestHub,
  type TestHub,
} from '../test-hub';

type Bridge = Awaited<ReturnType<typeof connectBridge>>;

describe('sweeps API', () => {
  let hub: TestHub;
  let bridge: Bridge;
  let tech: string;
  let admin: string;
  let viewer: string;

  beforeAll(async () => {
    hub = await startTestHub();
    bridge = await connectBridge(hub, 0);
    [tech, admin, viewer] = await Promise.all([
      hub.token('tech'),
      hub.token('admin'),
      hub.token('viewer'),
    ]);
  });
  afterAll(async () => {
    await bridge.close();
    await hub.close();
  });

  const post = (token: string, body: object) =>
    hub.api.post('/api/sweeps').set('authorization', `Bearer ${token}`).send(body);

  /** Ends whichever sweep bench A runs, as its bridge would. */
  async function finish(id: number, seqs: number[] = []) {
    if (seqs.length) bridge.send({ type: 'points', sweepId: id, points: makePoints(seqs) });
    bridge.send({
      type: 'sweep-ended',
      sweepId: id,
      reason: 'complete',
      count: seqs.length,
      message: '',
    });
    await eventually(
      async () => (await hub.services.sweeps.view(id)).status === 'complete',
      'ended',
    );
  }

  it('names the bad plan field in a validation error', async () => {
    const plan = { ...smallTriodePlan(), vaStopVolts: 'high' };
    const res = await post(tech, { benchId: 1, plan }).expect(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.fields).toHaveProperty(['plan.vaStopVolts']);
    const extra = await post(tech, { benchId: 1, plan: { ...smallTriodePlan(), vaMax: 1 } }).expect(
      400,
    );
    expect(extra.body.error.message).toContain('vaMax');
  });

  it('refuses a plan beyond the valve type ratings with the reason and the field', async () => {
    const plan = smallTriodePlan({ vaStopVolts: 350 });
    const res = await post(tech, { benchId: 1, plan, valveType: '12AX7' }).expect(422);
    expect(res.body.error.code).toBe('plan_outside_limits');
    expect(res.body.error.fields['plan.vaStopVolts']).toBe(
      'anode voltage 350 V is above the limit of 300 V (12AX7 maximum ratings)',
    );
    expect(res.body.error.message).toContain('350 V');
  });

  it('refuses section 2 of a single-section type, naming the field', async () => {
    const plan = { ...smallTriodePlan(), section: 2 };
    const res = await post(tech, { benchId: 1, plan, valveType: '300B' }).expect(422);
    expect(res.body.error.fields['plan.section']).toBe(
      '300B has one section: there is no section 2',
    );
    const bad = await post(tech, { benchId: 1, plan: { ...smallTriodePlan(), section: 3 } });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields).toHaveProperty(['plan.section']);
  });

  it('refuses a plan beyond the bench limits an admin set', async () => {
    await hub.api
      .patch('/api/benches/1')
      .set('authorization', `Bearer ${admin}`)
      .send({ limits: { vaMaxVolts: 200 } })
      .expect(200);
    const res = await post(admin, { benchId: 1, plan: smallTriodePlan(), override: true }).expect(
      422,
    );
    expect(res.body.error.fields['plan.vaStopVolts']).toContain('Bench A limits');
    await hub.api
      .patch('/api/benches/1')
      .set('authorization', `Bearer ${admin}`)
      .send({ limits: { vaMaxVolts: 500 } })
      .expect(200);
  });

  it('never lets an override past the tracer limits', async () => {
    const plan = smallTriodePlan({ vaStopVolts: 480, heaterVolts: 14 });
    const res = await post(admin, { benchId: 1, plan, valveType: '12AX7', override: true }).expect(
      422,
    );
    expect(res.body.error.fields['plan.heaterVolts']).toContain('tracer limits');
    expect(res.body.error.fields).not.toHaveProperty(['plan.vaStopVolts']);
  });

  it('refuses an override by a technician', async () => {
    const plan = smallTriodePlan({ vaStopVolts: 350 });
    const res = await post(tech, { benchId: 1, plan, valveType: '12AX7', override: true }).expect(
      403,
    );
    expect(res.body.error.code).toBe('override_forbidden');
  });

  it('accepts and audits an override by an admin', async () => {
    const plan = smallTriodePlan({ vaStopVolts: 350 });
    const res = await post(admin, { benchId: 1, plan, valveType: 'ecc83', override: true }).expect(
      201,
    );
    expect(res.body).toMatchObject({ status: 'pending', valveType: '12AX7', operator: 'admin' });
    await bridge.next('start-sweep', (m) => m.sweepId === res.body.id);
    const audit = await hub.api
      .get('/api/audit?action=sweep.start')
      .set('authorization', `Bearer ${admin}`)
      .expect(200);
    expect(audit.body.items[0]).toMatchObject({
      action: 'sweep.start',
      subject: `sweep:${res.body.id}`,
      username: 'admin',
      detail: {
        override: true,
        overriddenRatings: {
          'plan.vaStopVolts':
            'anode voltage 350 V is above the limit of 300 V (12AX7 maximum ratings)',
        },
      },
    });
    await finish(res.body.id);
  });

  it('refuses a second sweep while one runs, and any sweep on an offline bench', async () => {
    const first = await post(tech, { benchId: 1, plan: smallTriodePlan() }).expect(201);
    const busy = await post(tech, { benchId: 1, plan: smallTriodePlan() }).expect(409);
    expect(busy.body.error.code).toBe('bench_busy');
    const offline = await post(tech, { benchId: 2, plan: smallTriodePlan() }).expect(409);
    expect(offline.body.error.code).toBe('bench_offline');
    await post(tech, { benchId: 99, plan: smallTriodePlan() }).expect(404);
    await finish(first.body.id);
  });

  it('refuses an unknown valve type', async () => {
    const res = await post(tech, {
      benchId: 1,
      plan: smallTriodePlan(),
      valveType: 'XYZ123',
    }).expect(400);
    expect(res.body.error.fields).toHaveProperty('valveType');
  });

  it('forwards an abort to the bridge, audits it, and refuses one for an ended sweep', async () => {
    const { body } = await post(tech, { benchId: 1, plan: smallTriodePlan() }).expect(201);
    const res = await hub.api
      .post(`/api/sweeps/${body.id}/abort`)
      .set('authorization', `Bearer ${tech}`)
      .expect(202);
    expect(res.body.id).toBe(body.id);
    expect(await bridge.next('abort-sweep', (m) => m.sweepId === body.id)).toBeTruthy();
    bridge.send({
      type: 'sweep-ended',
      sweepId: body.id,
      reason: 'aborted',
      count: 0,
      message: 'ABORT',
    });
    await eventually(
      async () => (await hub.services.sweeps.view(body.id)).status === 'aborted',
      'aborted',
    );
    const again = await hub.api
      .post(`/api/sweeps/${body.id}/abort`)
      .set('authorization', `Bearer ${tech}`)
      .expect(409);
    expect(again.body.error.code).toBe('sweep_not_active');
    const audit = await hub.api
      .get('/api/audit?action=sweep.abort')
      .set('authorization', `Bearer ${admin}`);
    expect(audit.body.items[0]).toMatchObject({ subject: `sweep:${body.id}`, username: 'tech' });
  });

  it('exports a sweep as CSV with its conditions and as JSON', async () => {
    const { body } = await post(tech, {
      benchId: 1,
      plan: smallTriodePlan(),
      valveType: '12AX7',
      valveLabel: 'KL-0042',
    }).expect(201);
    await finish(body.id, [0, 1, 2]);
    const csv = await hub.api
      .get(`/api/sweeps/${body.id}/export?format=csv`)
      .set('authorization', `Bearer ${viewer}`)
      .expect(200);
    expect(csv.headers['content-type']).toMatch(/^text\/csv/);
    expect(csv.headers['content-disposition']).toMatch(
      new RegExp(`^attachment; filename="?sweep-${body.id}\\.csv"?$`),
    );
    const lines = csv.text.trimEnd().split('\n');
    const header = lines.findIndex((l) => !l.startsWith('#'));
    expect(header).toBeGreaterThan(3);
    expect(lines.slice(0, header).join('\n')).toMatch(
      /valve type: 12AX7[\s\S]*valve label: KL-0042/,
    );
    expect(lines.slice(0, header).join('\n')).toContain('heater: 12.6 V');
    expect(lines[header]).toBe(CSV_HEADER);
    expect(lines.slice(header + 1)).toEqual([
      '0,0,0,0,0,0,0',
      '1,1,10,-1,0,0.013,0',
      '2,2,20,-2,0,0.026,0',
    ]);

    const json = await hub.api
      .get(`/api/sweeps/${body.id}/export?format=json`)
      .set('authorization', `Bearer ${viewer}`)
      .expect(200);
    expect(json.headers['content-disposition']).toMatch(
      new RegExp(`^attachment; filename="?sweep-${body.id}\\.json"?$`),
    );
    const doc = JSON.parse(json.text);
    expect(doc.sweep).toMatchObject({ id: body.id, valveLabel: 'KL-0042', status: 'complete' });
    expect(doc.bench).toEqual({ id: 1, name: 'Bench A' });
    expect(doc.points).toEqual(makePoints([0, 1, 2]));
    await hub.api
      .get(`/api/sweeps/${body.id}/export?format=xlsx`)
      .set('authorization', `Bearer ${viewer}`)
      .expect(400);
  });

  it('pages, sorts and filters the sweep list on the server', async () => {
    const labels = ['list-a', 'list-b', 'list-c'];
    for (const [i, label] of labels.entries()) {
      const { body } = await post(tech, {
        benchId: 1,
        plan: smallTriodePlan(),
        valveLabel: label,
      }).expect(201);
      await finish(
        body.id,
        Array.from({ length: i + 1 }, (_, k) => k),
      );
    }
    const list = (query: string) =>
      hub.api.get(`/api/sweeps?${query}`).set('authorization', `Bearer ${viewer}`).expect(200);

    const page1 = await list('q=list-&pageSize=2&sort=pointCount&order=desc');
    expect(page1.body.total).toBe(3);
    expect(page1.body.items.map((s: { valveLabel: string }) => s.valveLabel)).toEqual([
      'list-c',
      'list-b',
    ]);
    const page2 = await list('q=list-&pageSize=2&page=2&sort=pointCount&order=desc');
    expect(page2.body.items.map((s: { valveLabel: string }) => s.valveLabel)).toEqual(['list-a']);
    expect(page2.body).toMatchObject({ page: 2, pageSize: 2 });

    const aborted = await list('status=aborted');
    expect(aborted.body.items.every((s: { status: string }) => s.status === 'aborted')).toBe(true);
    expect(aborted.body.total).toBe(1);
    const newest = await list('pageSize=1');
    expect(newest.body.items[0].valveLabel).toBe('list-c');
    expect((await list('benchId=2')).body.total).toBe(0);
    expect((await list('q=%25')).body.total).toBe(0); // a literal %, not a wildcard

    const bad = await hub.api
      .get('/api/sweeps?pageSize=500&sort=secret')
      .set('authorization', `Bearer ${viewer}`)
      .expect(400);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(['pageSize', 'sort']);
  });
});
