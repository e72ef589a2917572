import { afterEach, describe, expect, it } from 'vitest';
import type { BridgeToHub } from '../../../shared/hub/messages';
import { DEMO_BENCHES } from '../../../server/demo/demo-data';
import {
  connectBridge,
  eventually,
  JsonClient,
  makePoints,
  smallTriodePlan,
  startTestHub,
  testStatus,
  type TestHub,
} from '../test-hub';

type Bridge = Awaited<ReturnType<typeof connectBridge>>;

let hub: TestHub;
afterEach(() => hub?.close());

async function startSweep(bridge: Bridge, plan = smallTriodePlan()): Promise<number> {
  const res = await hub.api
    .post('/api/sweeps')
    .set('authorization', `Bearer ${await hub.token('tech')}`)
    .send({ benchId: bridge.benchId, plan, valveLabel: 'test valve' })
    .expect(201);
  const start = await bridge.next('start-sweep', (m) => m.sweepId === res.body.id);
  expect(start.plan).toEqual(plan);
  return res.body.id;
}

/** Sends a message and waits for the ack that follows it. */
async function sendPoints(bridge: Bridge, sweepId: number, seqs: number[]): Promise<number> {
  const from = bridge.received.length;
  const message: BridgeToHub = { type: 'points', sweepId, points: makePoints(seqs) };
  bridge.send(message);
  const ack = await bridge.next('ack-points', (m) => m.sweepId === sweepId, from);
  return ack.throughSeq;
}

async function sweepRecord(id: number) {
  const res = await hub.api
    .get(`/api/sweeps/${id}`)
    .set('authorization', `Bearer ${await hub.token('viewer')}`)
    .expect(200);
  return res.body;
}

describe('bridge protocol', () => {
  it('stores repeated and out-of-order points once and acknowledges cumulatively', async () => {
    hub = await startTestHub();
    const bridge = await connectBridge(hub);
    const id = await startSweep(bridge);
    bridge.send({ type: 'sweep-started', sweepId: id });
    await eventually(async () => (await sweepRecord(id)).status === 'running', 'running');

    expect(await sendPoints(bridge, id, [0, 1, 2])).toBe(2);
    expect(await sendPoints(bridge, id, [5, 6])).toBe(2);
    expect(await sendPoints(bridge, id, [0, 1, 2])).toBe(2);
    expect(await sendPoints(bridge, id, [4, 3])).toBe(6);
    expect(await sendPoints(bridge, id, [3, 4, 5, 6, 7, 8, 8])).toBe(8);

    const record = await sweepRecord(id);
    expect(record.pointCount).toBe(9);
    expect(record.points.map((p: { seq: number }) => p.seq)).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 8]);
    expect(record.points[4]).toEqual(makePoints([4])[0]);
    await bridge.close();
  });

  it('acknowledges the end once every reported point is stored', async () => {
    hub = await startTestHub();
    const bridge = await connectBridge(hub);
    const id = await startSweep(bridge);
    bridge.send({ type: 'sweep-started', sweepId: id });
    expect(await sendPoints(bridge, id, [0, 1, 2, 3])).toBe(3);
    bridge.send({ type: 'sweep-ended', sweepId: id, reason: 'complete', count: 6, message: '' });
    await eventually(async () => (await sweepRecord(id)).status === 'complete', 'complete');
    expect(bridge.all('ack-end')).toEqual([]);

    const from = bridge.received.length;
    expect(await sendPoints(bridge, id, [5, 4])).toBe(5);
    expect(await bridge.next('ack-end', (m) => m.sweepId === id, from)).toEqual({
      type: 'ack-end',
      sweepId: id,
    });
    const record = await sweepRecord(id);
    expect(record).toMatchObject({ status: 'complete', pointCount: 6, deviceCount: 6 });
    expect(record.endedAt).toEqual(expect.any(String));
    await bridge.close();
  });

  it('stores a whole-sweep resend of 20,000 points in one message', async () => {
    hub = await startTestHub();
    const bridge = await connectBridge(hub);
    const plan = smallTriodePlan({
      vaStopVolts: 399.8,
      vaStepVolts: 0.2,
      vg1Volts: [0, -1, -2, -3, -4, -5, -6, -7, -8, -9],
      iaMaxMilliamps: 2,
      iaTripMilliamps: 3,
      paMaxWatts: 0.5,
    });
    const id = await startSweep(bridge, plan);
    const seqs = Array.from({ length: 20000 }, (_, i) => 19999 - i);
    expect(await sendPoints(bridge, id, seqs)).toBe(19999);
    expect((await sweepRecord(id)).pointCount).toBe(20000);
    await bridge.close();
  });

  it('drops points beyond the plan and ignores sweeps of other benches', async () => {
    hub = await startTestHub();
    const a = await connectBridge(hub, 0);
    const b = await connectBridge(hub, 1);
    const id = await startSweep(a);
    expect(await sendPoints(a, id, [0, 1, 21, 500])).toBe(1);
    b.send({ type: 'points', sweepId: id, points: makePoints([2, 3]) });
    b.send({ type: 'sweep-ended', sweepId: id, reason: 'fault', count: 2, message: 'not mine' });
    await eventually(
      () => hub.logger.lines.filter((l) => l.includes('of bench 1; ignored')).length === 2,
      'ignore',
    );
    const record = await sweepRecord(id);
    expect(record.pointCount).toBe(2);
    expect(record.status).toBe('pending');
    expect(b.all('ack-points')).toEqual([]);
    await Promise.all([a.close(), b.close()]);
  });

  it('records a refusal as a fault with the reason', async () => {
    hub = await startTestHub();
    const bridge = await connectBridge(hub);
    const id = await startSweep(bridge);
    bridge.send({ type: 'sweep-refused', sweepId: id, message: 'E21 plan outside device limits' });
    await bridge.next('ack-end', (m) => m.sweepId === id);
    const record = await sweepRecord(id);
    expect(record.status).toBe('fault');
    expect(record.endMessage).toContain('E21 plan outside device limits');
    await bridge.close();
  });

  it('marks a sweep link-lost when its bridge stays away past the grace period', async () => {
    hub = await startTestHub({ linkGraceMs: 300 });
    const bridge = await connectBridge(hub);
    const id = await startSweep(bridge);
    bridge.send({ type: 'sweep-started', sweepId: id });
    await eventually(async () => (await sweepRecord(id)).status === 'running', 'running');
    await bridge.close();
    expect((await sweepRecord(id)).status).toBe('running');
    const record = await eventually(async () => {
      const r = await sweepRecord(id);
      return r.status === 'link-lost' && r;
    }, 'link-lost');
    expect(record.endMessage).toContain('gone for more than');
  });

  it('gives a sweep up when its connected bridge keeps reporting no sweep past the grace', async () => {
    hub = await startTestHub({ linkGraceMs: 300 });
    const bridge = await connectBridge(hub);
    const id = await startSweep(bridge);
    bridge.send({ type: 'sweep-started', sweepId: id });
    bridge.send({ type: 'status', status: testStatus(null) });
    await bridge.next('abort-sweep', (m) => m.sweepId === id);
    expect((await sweepRecord(id)).status).toBe('link-lost');
    await bridge.close();
  });

  it('keeps a sweep running when its bridge comes back within the grace period', async () => {
    hub = await startTestHub({ linkGraceMs: 1000 });
    const first = await connectBridge(hub);
    const id = await startSweep(first);
    first.send({ type: 'sweep-started', sweepId: id });
    expect(await sendPoints(first, id, [0, 1, 2])).toBe(2);
    await first.close();

    const again = await connectBridge(hub);
    again.send({ type: 'status', status: testStatus(id) });
    expect(await sendPoints(again, id, [1, 2, 3, 4])).toBe(4);
    await new Promise((r) => setTimeout(r, 1500));
    expect((await sweepRecord(id)).status).toBe('running');

    again.send({ type: 'sweep-ended', sweepId: id, reason: 'complete', count: 5, message: '' });
    await again.next('ack-end', (m) => m.sweepId === id);
    expect(await sweepRecord(id)).toMatchObject({ status: 'complete', pointCount: 5 });
    await again.close();
  });

  it('gives up on a sweep the bench never starts and tells the bench to abort it', async () => {
    hub = await startTestHub({ startTimeoutMs: 300 });
    const bridge = await connectBridge(hub);
    const id = await startSweep(bridge);
    await bridge.next('abort-sweep', (m) => m.sweepId === id);
    const record = await sweepRecord(id);
    expect(record.status).toBe('fault');
    expect(record.endMessage).toContain('did not start');
    await bridge.close();
  });

  it('replaces an older connection of the same bench with a newer one', async () => {
    hub = await startTestHub({ linkGraceMs: 300 });
    const first = await connectBridge(hub);
    const id = await startSweep(first);
    first.send({ type: 'sweep-started', sweepId: id });
    const closed = new Promise<number>((resolve) =>
      first.ws.once('close', (code) => resolve(code)),
    );
    const second = await JsonClient.open(`${hub.wsUrl}/ws/bridge`, {
      headers: { authorization: `Bearer ${DEMO_BENCHES[0].token}` },
    });
    expect(await closed).toBe(4000);
    expect(hub.services.presence.isOnline(first.benchId)).toBe(true);
    await new Promise((r) => setTimeout(r, 600));
    expect((await sweepRecord(id)).status).toBe('running');
    await second.close();
  });

  it('ends a running sweep on the bench when the hub has already ended it', async () => {
    hub = await startTestHub();
    const bridge = await connectBridge(hub);
    const id = await startSweep(bridge);
    bridge.send({ type: 'sweep-ended', sweepId: id, reason: 'aborted', count: 0, message: '' });
    await bridge.next('ack-end', (m) => m.sweepId === id);
    bridge.send({ type: 'status', status: testStatus(id) });
    await bridge.next('abort-sweep', (m) => m.sweepId === id);
    await bridge.close();
  });

  it('ends the record at once when an abort finds the bench offline', async () => {
    hub = await startTestHub();
    const bridge = await connectBridge(hub);
    const id = await startSweep(bridge);
    await bridge.close();
    const res = await hub.api
      .post(`/api/sweeps/${id}/abort`)
      .set('authorization', `Bearer ${await hub.token('tech')}`)
      .expect(202);
    expect(res.body).toMatchObject({ status: 'aborted' });
    expect(res.body.endMessage).toContain('while the bench was offline');
  });

  it('refuses to start a sweep while the bridge has no tracer connected', async () => {
    hub = await startTestHub();
    const bridge = await JsonClient.open<{ type: string }>(`${hub.wsUrl}/ws/bridge`, {
      headers: { authorization: `Bearer ${DEMO_BENCHES[0].token}` },
    });
    await bridge.next('welcome');
    bridge.send({
      type: 'hello',
      bridgeVersion: 'test',
      capabilities: null,
      status: { ...testStatus(), deviceOnline: false, state: null },
    });
    await eventually(() => hub.services.presence.status(1), 'hello handled');
    const res = await hub.api
      .post('/api/sweeps')
      .set('authorization', `Bearer ${await hub.token('tech')}`)
      .send({ benchId: 1, plan: smallTriodePlan() })
      .expect(409);
    expect(res.body.error.code).toBe('device_offline');
    await bridge.close();
  });

  it('resumes the grace period of unfinished sweeps after a hub restart', async () => {
    const first = await startTestHub();
    const bridge = await connectBridge(first);
    hub = first;
    const id = await startSweep(bridge);
    bridge.send({ type: 'sweep-started', sweepId: id });
    await eventually(async () => (await sweepRecord(id)).status === 'running', 'running');
    await first.stop();

    hub = await startTestHub({ linkGraceMs: 500 }, first.config.dataDir);
    expect((await hub.services.sweeps.view(id)).status).toBe('running');
    const record = await eventually(async () => {
      const r = await sweepRecord(id);
      return r.status === 'link-lost' && r;
    }, 'link-lost after restart');
    expect(record.pointCount).toBe(0);
  });
});
