import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEFAULT_BENCH_LIMITS } from '../../../server/benches/bench.service';
import { JsonClient, startTestHub, type TestHub } from '../test-hub';

describe('benches API', () => {
  let hub: TestHub;
  let admin: string;
  beforeAll(async () => {
    hub = await startTestHub();
    admin = await hub.token('admin');
  });
  afterAll(() => hub.close());

  it('lists the demo benches with their limits and live state', async () => {
    const res = await hub.api
      .get('/api/benches')
      .set('authorization', `Bearer ${await hub.token('viewer')}`)
      .expect(200);
    expect(res.body).toEqual([
      {
        id: 1,
        name: 'Bench A',
        bridgeOnline: false,
        capabilities: null,
        status: null,
        limits: DEFAULT_BENCH_LIMITS,
        extensions: null,
        lastSeenAt: null,
      },
      {
        id: 2,
        name: 'Bench B',
        bridgeOnline: false,
        capabilities: null,
        status: null,
        limits: DEFAULT_BENCH_LIMITS,
        extensions: null,
        lastSeenAt: null,
      },
    ]);
  });

  it('creates a bench whose token, shown once, lets its bridge in', async () => {
    const res = await hub.api
      .post('/api/benches')
      .set('authorization', `Bearer ${admin}`)
      .send({ name: 'Bench C', limits: { vaMaxVolts: 350 } })
      .expect(201);
    expect(res.body.bench).toMatchObject({
      name: 'Bench C',
      limits: { ...DEFAULT_BENCH_LIMITS, vaMaxVolts: 350 },
    });
    expect(res.body.token).toMatch(/^bench-[A-Za-z0-9_-]{40,}$/);
    const list = await hub.api.get('/api/benches').set('authorization', `Bearer ${admin}`);
    expect(JSON.stringify(list.body)).not.toContain(res.body.token);

    const bridge = await JsonClient.open<{ type: string; benchId?: number }>(
      `${hub.wsUrl}/ws/bridge`,
      {
        headers: { authorization: `Bearer ${res.body.token}` },
      },
    );
    expect(await bridge.next('welcome')).toMatchObject({ benchId: res.body.bench.id });
    await bridge.close();

    const dup = await hub.api
      .post('/api/benches')
      .set('authorization', `Bearer ${admin}`)
      .send({ name: 'Bench C' })
      .expect(409);
    expect(dup.body.error.code).toBe('bench_name_taken');
    const audit = await hub.api
      .get('/api/audit?action=bench.create')
      .set('authorization', `Bearer ${admin}`);
    expect(audit.body.items).toHaveLength(1);
    expect(audit.body.items[0]).toMatchObject({
      subject: `bench:${res.body.bench.id}`,
      username: 'admin',
    });
    expect(JSON.stringify(audit.body)).not.toContain(res.body.token);
  });

  it('changes limits and audits the change with before and after', async () => {
    const res = await hub.api
      .patch('/api/benches/2')
      .set('authorization', `Bearer ${admin}`)
      .send({ limits: { paMaxWatts: 30, iaMaxMilliamps: 150 } })
      .expect(200);
    expect(res.body.limits).toEqual({
      ...DEFAULT_BENCH_LIMITS,
      paMaxWatts: 30,
      iaMaxMilliamps: 150,
    });
    const audit = await hub.api
      .get('/api/audit?action=bench.update')
      .set('authorization', `Bearer ${admin}`);
    expect(audit.body.items[0]).toMatchObject({
      subject: 'bench:2',
      detail: { before: { limits: DEFAULT_BENCH_LIMITS }, after: { limits: res.body.limits } },
    });
  });

  it('refuses limits that are not positive, naming the field', async () => {
    const res = await hub.api
      .patch('/api/benches/2')
      .set('authorization', `Bearer ${admin}`)
      .send({ limits: { vaMaxVolts: -5 } })
      .expect(400);
    expect(Object.keys(res.body.error.fields)).toEqual(['limits.vaMaxVolts']);
    await hub.api
      .patch('/api/benches/2')
      .set('authorization', `Bearer ${admin}`)
      .send({})
      .expect(400);
    await hub.api
      .patch('/api/benches/77')
      .set('authorization', `Bearer ${admin}`)
      .send({ name: 'x' })
      .expect(404);
  });
});
