import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import type { HubToBrowser } from '../../../shared/hub/messages';
import {
  connectBridge,
  eventually,
  JsonClient,
  makePoints,
  smallTriodePlan,
  startTestHub,
  type TestHub,
} from '../test-hub';

type Browser = JsonClient<HubToBrowser>;

let hub: TestHub;
beforeEach(async () => {
  hub = await startTestHub();
});
afterEach(() => hub.close());

async function openBrowser(user: 'admin' | 'tech' | 'viewer'): Promise<Browser> {
  return JsonClient.open<HubToBrowser>(`${hub.wsUrl}/ws/live?token=${await hub.token(user)}`);
}

async function runningSweep() {
  const bridge = await connectBridge(hub);
  const res = await hub.api
    .post('/api/sweeps')
    .set('authorization', `Bearer ${await hub.token('tech')}`)
    .send({ benchId: bridge.benchId, plan: smallTriodePlan(), valveType: '12AX7' })
    .expect(201);
  const id: number = res.body.id;
  bridge.send({ type: 'sweep-started', sweepId: id });
  await eventually(
    async () => (await hub.services.sweeps.view(id)).status === 'running',
    'running',
  );
  return { bridge, id };
}

/** Every point seq a browser has received for a sweep, in arrival order. */
function seqsOf(browser: Browser, sweepId: number): number[] {
  return browser
    .all('points')
    .filter((m) => m.sweepId === sweepId)
    .flatMap((m) => m.points.map((p) => p.seq));
}

describe('browser live socket', () => {
  it('sends the benches on connect and again when a bridge comes online', async () => {
    const browser = await openBrowser('viewer');
    const first = await browser.next('benches');
    expect(first.benches.map((b) => [b.name, b.bridgeOnline])).toEqual([
      ['Bench A', false],
      ['Bench B', false],
    ]);
    const bridge = await connectBridge(hub);
    const online = await browser.next('benches', (m) => m.benches[0].capabilities !== null);
    expect(online.benches[0]).toMatchObject({ bridgeOnline: true, status: { deviceOnline: true } });
    await bridge.close();
    await browser.next(
      'benches',
      (m) => !m.benches[0].bridgeOnline,
      browser.received.indexOf(online) + 1,
    );
    await browser.close();
  });

  it('gives a watcher the sweep, the stored points, then live points', async () => {
    const { bridge, id } = await runningSweep();
    bridge.send({ type: 'points', sweepId: id, points: makePoints([0, 1, 2, 3]) });
    await bridge.next('ack-points', (m) => m.throughSeq === 3);

    const browser = await openBrowser('viewer');
    await browser.next('benches');
    browser.send({ type: 'watch-sweep', sweepId: id });
    const sweep = await browser.next('sweep', (m) => m.sweep.id === id);
    expect(sweep.sweep).toMatchObject({ status: 'running', valveType: '12AX7', pointCount: 4 });
    await eventually(() => seqsOf(browser, id).length === 4, 'stored points');
    const sweepIndex = browser.received.indexOf(sweep);
    const firstPoints = browser.received.findIndex((m) => m.type === 'points');
    expect(firstPoints).toBeGreaterThan(sweepIndex);

    bridge.send({ type: 'points', sweepId: id, points: makePoints([3, 4, 5]) });
    bridge.send({ type: 'points', sweepId: id, points: makePoints([7, 6]) });
    await eventually(() => seqsOf(browser, id).length === 8, 'live points');
    expect(seqsOf(browser, id)).toEqual([0, 1, 2, 3, 4, 5, 6, 7]);
    const live = browser.all('points').at(-1)!;
    expect(live.points[0]).toEqual(makePoints([6])[0]);

    bridge.send({ type: 'sweep-ended', sweepId: id, reason: 'complete', count: 8, message: '' });
    const ended = await browser.next('sweep', (m) => m.sweep.status === 'complete');
    expect(ended.sweep).toMatchObject({ id, pointCount: 8, deviceCount: 8 });
    await Promise.all([browser.close(), bridge.close()]);
  });

  it('stops sending points of a sweep after unwatch', async () => {
    const { bridge, id } = await runningSweep();
    const browser = await openBrowser('viewer');
    browser.send({ type: 'watch-sweep', sweepId: id });
    await browser.next('sweep', (m) => m.sweep.id === id);
    bridge.send({ type: 'points', sweepId: id, points: makePoints([0]) });
    await eventually(() => seqsOf(browser, id).length === 1, 'first point');
    browser.send({ type: 'unwatch-sweep', sweepId: id });
    // A second watcher proves the later points were fanned out while the first was not watching.
    const other = await openBrowser('tech');
    other.send({ type: 'watch-sweep', sweepId: id });
    await other.next('sweep', (m) => m.sweep.id === id);
    bridge.send({ type: 'points', sweepId: id, points: makePoints([1, 2]) });
    await eventually(() => seqsOf(other, id).length === 3, 'other watcher');
    expect(seqsOf(browser, id)).toEqual([0]);
    await Promise.all([browser.close(), other.close(), bridge.close()]);
  });

  it('refuses an abort from a viewer and forwards one from a technician', async () => {
    const { bridge, id } = await runningSweep();
    const viewer = await openBrowser('viewer');
    viewer.send({ type: 'abort-sweep', sweepId: id });
    const error = await viewer.next('error');
    expect(error.code).toBe('forbidden');
    expect(bridge.all('abort-sweep')).toEqual([]);

    const tech = await openBrowser('tech');
    tech.send({ type: 'abort-sweep', sweepId: id });
    expect(await bridge.next('abort-sweep')).toEqual({ type: 'abort-sweep', sweepId: id });
    expect(tech.all('error')).toEqual([]);
    await Promise.all([viewer.close(), tech.close(), bridge.close()]);
  });

  it('answers a malformed message or an unknown sweep with an error', async () => {
    const browser = await openBrowser('viewer');
    browser.ws.send('not json');
    expect((await browser.next('error')).code).toBe('bad_message');
    browser.send({ type: 'watch-sweep', sweepId: 4242 });
    expect((await browser.next('error', (m) => m.code !== 'bad_message')).code).toBe(
      'sweep_not_found',
    );
    await browser.close();
  });
});
