import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import type {
  BridgeToHub,
  HubToBridge,
  HubToBrowser,
  QuickTestView,
} from '../../../shared/hub/messages';
import type {
  CheckPlan,
  CheckReading,
  DeviceExtensions,
} from '../../../shared/protocol/check-plan';
import {
  connectBridge,
  eventually,
  JsonClient,
  smallTriodePlan,
  startTestHub,
  testStatus,
  type TestHub,
} from '../test-hub';

const EXTENSIONS: DeviceExtensions = {
  features: ['leakage', 'emission', 'grid-current'],
  gridFeedKiloohms: 47,
  leakageMaxVolts: 200,
};

type Bridge = JsonClient<HubToBridge> & { benchId: number };
type StartCheck = Extract<HubToBridge, { type: 'start-check' }>;

/** A bridge of a demo bench whose tracer announced the optional functions. */
async function benchWithExtensions(hub: TestHub, bench: 0 | 1 = 0): Promise<Bridge> {
  const bridge = await connectBridge(hub, bench);
  bridge.send({
    type: 'hello',
    bridgeVersion: 'test',
    capabilities: (await import('../test-hub')).TEST_CAPABILITIES,
    status: testStatus(),
    extensions: EXTENSIONS,
  } satisfies BridgeToHub);
  await eventually(() => hub.services.presence.extensions(bridge.benchId), 'extensions');
  return bridge;
}

/**
 * Readings a 12AX7 would give (RCA operating point 250 V / -2 V, 1600 uS nominal): gm given in
 * uS at nominal heater, falling `dropPercent` at reduced heater; the rest sound unless changed.
 */
function readingsFor(
  check: CheckPlan,
  o: { gm?: number; dropPercent?: number; akMicroamps?: number; ig1?: number } = {},
): CheckReading[] {
  switch (check.kind) {
    case 'leakage':
      return check.pairs.map(({ pair, volts }) => {
        const ua = pair === 'anode-cathode' ? (o.akMicroamps ?? 0.03) : 0.05;
        return { kind: 'leakage', pair, volts, microamps: Math.min(ua, 500), overRange: ua > 500 };
      });
    case 'transfer': {
      const reduced = check.plan.heaterVolts < 12;
      const gm = ((o.gm ?? 1600) / 1000) * (reduced ? 1 - (o.dropPercent ?? 1) / 100 : 1);
      return check.plan.vg1Volts.map((vg1, seq) => ({
        kind: 'point',
        seq,
        curve: 0,
        vaVolts: 250,
        vg1Volts: vg1,
        vg2Volts: 0,
        iaMilliamps: Math.round((1 + gm * (vg1 + 2)) * 1e4) / 1e4,
        ig2Milliamps: 0,
      }));
    }
    case 'grid-current':
      return [
        {
          kind: 'grid-current',
          vaVolts: 250,
          vg1Volts: -2,
          vg2Volts: 0,
          iaMilliamps: 1,
          ig1Microamps: o.ig1 ?? -0.002,
          gridKiloohms: 47,
        },
      ];
    case 'emission':
      return [{ kind: 'emission', vaVolts: check.vaVolts, milliamps: 17.5, overRange: false }];
  }
}

/** Answers every start-check from `from` on like a tracer that runs it, until the test ends. */
async function runBench(
  hub: TestHub,
  bridge: Bridge,
  id: number,
  o: Parameters<typeof readingsFor>[1] = {},
): Promise<QuickTestView> {
  let answered = 0;
  for (;;) {
    const view = await get(hub, id);
    if (view.status !== 'running' && view.status !== 'pending') return view;
    const starts = bridge.all('start-check');
    if (starts.length > answered) {
      const m = starts[answered++];
      bridge.send({ type: 'check-started', checkId: m.checkId });
      bridge.send({
        type: 'check-ended',
        checkId: m.checkId,
        reason: 'complete',
        message: 'complete',
        errorCode: null,
        readings: readingsFor(m.check, o),
      });
    }
    await new Promise((r) => setTimeout(r, 10));
  }
}

async function get(hub: TestHub, id: number): Promise<QuickTestView> {
  const res = await hub.api
    .get(`/api/quick-tests/${id}`)
    .set('authorization', `Bearer ${await hub.token('viewer')}`)
    .expect(200);
  return res.body as QuickTestView;
}

async function post(hub: TestHub, body: unknown, user: 'tech' | 'viewer' | 'admin' = 'tech') {
  return hub.api
    .post('/api/quick-tests')
    .set('authorization', `Bearer ${await hub.token(user)}`)
    .send(body as object);
}

describe('quick tests on the hub', () => {
  let hub: TestHub;
  const open: { close(): Promise<void> }[] = [];
  beforeAll(async () => {
    hub = await startTestHub({ startTimeoutMs: 2000 });
  });
  afterEach(async () => {
    for (const c of open.splice(0)) await c.close();
    await eventually(() => !hub.services.presence.isOnline(1), 'bench 1 offline');
  });
  afterAll(() => hub.close());

  it('runs a quick-test set step by step and grades it, with the reason', async () => {
    const bridge = await benchWithExtensions(hub);
    open.push(bridge);
    const res = await post(hub, {
      benchId: bridge.benchId,
      valveType: 'ECC83',
      valveLabel: 'QT-1',
    });
    expect(res.status).toBe(201);
    const started = res.body as QuickTestView;
    expect(started).toMatchObject({
      valveType: '12AX7',
      valveLabel: 'QT-1',
      status: 'running',
      stepCount: 5,
      parts: ['leakage', 'gm', 'grid-current', 'emission', 'reduced-heater'],
    });
    const first = await bridge.next('start-check');
    expect(first.check.kind).toBe('leakage');
    // gm 1024 of 1600 uS is 64 % of nominal: 'weak' (fair from 65 %, common practice).
    const done = await runBench(hub, bridge, started.id, { gm: 1024 });
    expect(done.status).toBe('complete');
    expect(done.grade).toMatchObject({
      grade: 'weak',
      reason: 'gm 64 % of nominal (1020 of 1600 uS) at 250 V / -2 V',
    });
    expect(done.results.map((r) => r.status)).toEqual(['done', 'done', 'done', 'done', 'done']);
    expect(bridge.all('start-check').map((m) => m.check.kind)).toEqual([
      'leakage',
      'transfer',
      'grid-current',
      'emission',
      'transfer',
    ]);
  });

  it('streams progress and the warm-up countdown to browsers; a viewer watches but cannot abort', async () => {
    const bridge = await benchWithExtensions(hub);
    open.push(bridge);
    const viewer = await JsonClient.open<HubToBrowser>(
      `${hub.wsUrl}/ws/live?token=${await hub.token('viewer')}`,
    );
    open.push(viewer);
    await viewer.next('benches');
    const { body } = await post(hub, { benchId: bridge.benchId, valveType: '12AX7' });
    const start = await bridge.next('start-check');
    bridge.send({ type: 'check-started', checkId: start.checkId });
    bridge.send({
      type: 'status',
      status: {
        ...testStatus(),
        state: 'warming',
        heaterVolts: 12.6,
        warmupLeftSeconds: 17,
        checkId: start.checkId,
      },
    });
    const counting = await viewer.next(
      'quick-test',
      (m) => m.quickTest.id === body.id && m.quickTest.warmupLeftSeconds === 17,
    );
    expect(counting.quickTest).toMatchObject({ currentPart: 'leakage', status: 'running' });
    expect(counting.quickTest.results[0].status).toBe('running');

    viewer.send({ type: 'abort-quick-test', quickTestId: body.id });
    expect((await viewer.next('error')).code).toBe('forbidden');
    const tech = await JsonClient.open<HubToBrowser>(
      `${hub.wsUrl}/ws/live?token=${await hub.token('tech')}`,
    );
    open.push(tech);
    await tech.next('benches');
    tech.send({ type: 'abort-quick-test', quickTestId: body.id });
    const abort = await bridge.next('abort-check');
    expect(abort.checkId).toBe(start.checkId);
    bridge.send({
      type: 'check-ended',
      checkId: start.checkId,
      reason: 'aborted',
      message: 'aborted on request',
      errorCode: null,
      readings: [],
    });
    const ended = await viewer.next('quick-test', (m) => m.quickTest.status === 'aborted');
    expect(ended.quickTest.grade).toBeNull();
  });

  it('stops after a short found in the leakage check: no high voltage after, graded short', async () => {
    const bridge = await benchWithExtensions(hub);
    open.push(bridge);
    const { body } = await post(hub, { benchId: bridge.benchId, valveType: '12AX7' });
    const done = await runBench(hub, bridge, body.id, { akMicroamps: 1000 });
    expect(done.grade?.grade).toBe('short');
    expect(done.grade?.reason).toMatch(/^anode-cathode short/);
    expect(bridge.all('start-check')).toHaveLength(1);
    expect(done.results.slice(1).every((r) => r.status === 'skipped')).toBe(true);
  });

  it('goes on past a step the bench refuses, and fails the part with the reason', async () => {
    const bridge = await benchWithExtensions(hub);
    open.push(bridge);
    const { body } = await post(hub, {
      benchId: bridge.benchId,
      valveType: '12AX7',
      parts: ['grid-current', 'gm'],
    });
    const first = await bridge.next('start-check');
    expect(first.check.kind).toBe('transfer');
    bridge.send({ type: 'check-refused', checkId: first.checkId, message: 'E21 out of range' });
    const second = await bridge.next('start-check', (m) => m.checkId !== first.checkId);
    bridge.send({ type: 'check-started', checkId: second.checkId });
    bridge.send({
      type: 'check-ended',
      checkId: second.checkId,
      reason: 'complete',
      message: 'complete',
      errorCode: null,
      readings: readingsFor(second.check, { ig1: -0.5 }),
    });
    const done = await eventually(async () => {
      const v = await get(hub, body.id);
      return v.status === 'complete' ? v : undefined;
    }, 'quick test complete');
    expect(done.results[0]).toMatchObject({ part: 'gm', status: 'failed' });
    expect(done.results[0].message).toContain('E21 out of range');
    expect(done.grade?.grade).toBe('gassy');
  });

  it('ends the quick test as link-lost when the bridge goes away', async () => {
    const bridge = await benchWithExtensions(hub);
    const { body } = await post(hub, { benchId: bridge.benchId, valveType: '12AX7' });
    await bridge.next('start-check');
    await bridge.close();
    const lost = await eventually(async () => {
      const v = await get(hub, body.id);
      return v.status === 'link-lost' ? v : undefined;
    }, 'link-lost');
    expect(lost.endMessage).toMatch(/bridge went away/);
  });

  it('refuses what it cannot run safely or at all, with the reason', async () => {
    expect((await post(hub, { benchId: 1, valveType: '12AX7' })).body.error.code).toBe(
      'bench_offline',
    );
    const bridge = await benchWithExtensions(hub);
    open.push(bridge);
    const unknown = await post(hub, { benchId: bridge.benchId, valveType: 'XYZ99' });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.fields.valveType).toBe('unknown valve type XYZ99');
    expect(
      (await post(hub, { benchId: bridge.benchId, valveType: '12AX7' }, 'viewer')).status,
    ).toBe(403);

    // A bench limit below the operating point leaves gm out (with the reason) but runs the rest.
    const admin = await hub.token('admin');
    await hub.api
      .patch(`/api/benches/${bridge.benchId}`)
      .set('authorization', `Bearer ${admin}`)
      .send({ limits: { vaMaxVolts: 150 } })
      .expect(200);
    try {
      const only = await post(hub, { benchId: bridge.benchId, valveType: '12AX7', parts: ['gm'] });
      expect(only.status).toBe(422);
      expect(only.body.error.code).toBe('nothing_to_test');
      expect(only.body.error.message).toMatch(/anode voltage 250 V is above the limit of 150 V/);
      const some = await post(hub, {
        benchId: bridge.benchId,
        valveType: '12AX7',
        parts: ['leakage', 'gm'],
      });
      expect(some.status).toBe(201);
      expect(some.body.results[1]).toMatchObject({ part: 'gm', status: 'skipped' });
      const leak = await bridge.next('start-check');
      expect(leak.check.kind === 'leakage' && leak.check.pairs.every((p) => p.volts <= 100)).toBe(
        true,
      );
      // One thing at a time on a bench.
      const busy = await post(hub, { benchId: bridge.benchId, valveType: '12AX7' });
      expect(busy.status).toBe(409);
      expect(busy.body.error.code).toBe('bench_busy');
      await runBench(hub, bridge, some.body.id);
    } finally {
      await hub.api
        .patch(`/api/benches/${bridge.benchId}`)
        .set('authorization', `Bearer ${admin}`)
        .send({ limits: { vaMaxVolts: 500 } })
        .expect(200);
    }
  });

  it('does not start while a sweep runs on the bench', async () => {
    const bridge = await benchWithExtensions(hub);
    open.push(bridge);
    const tech = await hub.token('tech');
    const sweep = await hub.api
      .post('/api/sweeps')
      .set('authorization', `Bearer ${tech}`)
      .send({ benchId: bridge.benchId, plan: smallTriodePlan(), valveType: '12AX7' })
      .expect(201);
    const busy = await post(hub, { benchId: bridge.benchId, valveType: '12AX7' });
    expect(busy.body.error.code).toBe('bench_busy');
    await hub.api
      .post(`/api/sweeps/${sweep.body.id}/abort`)
      .set('authorization', `Bearer ${tech}`)
      .expect(202);
    await bridge.next('abort-sweep');
    bridge.send({
      type: 'sweep-ended',
      sweepId: sweep.body.id,
      reason: 'aborted',
      count: 0,
      message: 'aborted before the tracer started it',
    });
    await eventually(async () => {
      const s = await hub.api
        .get(`/api/sweeps/${sweep.body.id}`)
        .set('authorization', `Bearer ${tech}`);
      return s.body.status === 'aborted';
    }, 'sweep ended');
  });

  it('keeps quick tests on the valve record and lists them by valve, newest first', async () => {
    const bridge = await benchWithExtensions(hub);
    open.push(bridge);
    const tech = await hub.token('tech');
    const valve = await hub.api
      .post('/api/valves')
      .set('authorization', `Bearer ${tech}`)
      .send({ type: '12AX7', label: 'QT-VALVE-1' })
      .expect(201);
    const ids: number[] = [];
    for (let i = 0; i < 2; i++) {
      const res = await post(hub, {
        benchId: bridge.benchId,
        valveType: '12AX7',
        valveId: valve.body.id,
        parts: ['gm'],
      });
      expect(res.status).toBe(201);
      expect(res.body).toMatchObject({ valveId: valve.body.id, valveLabel: 'QT-VALVE-1' });
      ids.push(res.body.id);
      await runBench(hub, bridge, res.body.id);
    }
    const wrongType = await post(hub, {
      benchId: bridge.benchId,
      valveType: 'EL34',
      valveId: valve.body.id,
    });
    expect(wrongType.status).toBe(422);
    const page = await hub.api
      .get(`/api/quick-tests?valveId=${valve.body.id}&pageSize=1`)
      .set('authorization', `Bearer ${await hub.token('viewer')}`)
      .expect(200);
    expect(page.body.total).toBe(2);
    expect(page.body.items.map((q: QuickTestView) => q.id)).toEqual([ids[1]]);
    expect(page.body.items[0].grade.grade).toBe('strong');
  });

  it("grades the record by its newest quick test: gm's percentage, then a hard fail", async () => {
    const bridge = await benchWithExtensions(hub);
    open.push(bridge);
    const tech = await hub.token('tech');
    const valve = await hub.api
      .post('/api/valves')
      .set('authorization', `Bearer ${tech}`)
      .send({ type: '12AX7', label: 'QT-VALVE-2' })
      .expect(201);
    const detail = async () =>
      (
        await hub.api
          .get(`/api/valves/${valve.body.id}`)
          .set('authorization', `Bearer ${await hub.token('viewer')}`)
          .expect(200)
      ).body;
    expect((await detail()).grade).toBeNull();

    // gm 1200 of the data sheet's 1600 uS: 75 %, fair between the common-practice 65 % and 80 %.
    const first = await post(hub, {
      benchId: bridge.benchId,
      valveType: '12AX7',
      valveId: valve.body.id,
      parts: ['gm'],
    });
    await runBench(hub, bridge, first.body.id, { gm: 1200 });
    const fair = await detail();
    expect(fair).toMatchObject({ grade: 'fair', gradeSource: 'quick-test' });
    expect(fair.percentOfNominal).toBeCloseTo(75, 0);
    expect(fair.quickTests).toHaveLength(1);
    expect(fair.quickTests[0]).toMatchObject({
      id: first.body.id,
      status: 'complete',
      grade: 'fair',
    });
    expect(fair.quickTests[0].gmMicrosiemens).toBeCloseTo(1200, -1);
    expect(fair.quickTests[0].reason).toMatch(/^gm 75(\.\d)? % of nominal/);

    // A later short decides, whatever the gm was.
    const second = await post(hub, {
      benchId: bridge.benchId,
      valveType: '12AX7',
      valveId: valve.body.id,
    });
    await runBench(hub, bridge, second.body.id, { akMicroamps: 1000 });
    const shorted = await detail();
    expect(shorted.grade).toBe('short');
    expect(shorted.quickTests.map((q: { id: number }) => q.id)).toEqual([
      second.body.id,
      first.body.id,
    ]);
    const list = await hub.api
      .get('/api/valves?grade=short')
      .set('authorization', `Bearer ${tech}`)
      .expect(200);
    expect(list.body.items.map((v: { label: string }) => v.label)).toEqual(['QT-VALVE-2']);
  });

  it("judges gas by the workshop's limit in force when the test starts", async () => {
    const bridge = await benchWithExtensions(hub);
    open.push(bridge);
    const admin = await hub.token('admin');
    const gasOf = async () => {
      const { body } = await post(hub, {
        benchId: bridge.benchId,
        valveType: '12AX7',
        parts: ['grid-current'],
      });
      return (await runBench(hub, bridge, body.id, { ig1: -0.5 })).grade;
    };
    // 0.5 uA reverse grid current: gassy by the default 0.2 uA limit.
    expect((await gasOf())?.grade).toBe('gassy');
    await hub.api
      .put('/api/settings')
      .set('authorization', `Bearer ${admin}`)
      .send({ quickTestLimits: { gasMaxMicroamps: 1 } })
      .expect(200);
    try {
      const grade = await gasOf();
      expect(grade?.grade).not.toBe('gassy');
      expect(grade?.findings.find((f) => f.criterion === 'gas')?.verdict).toBe('pass');
    } finally {
      await hub.api
        .put('/api/settings')
        .set('authorization', `Bearer ${admin}`)
        .send({ quickTestLimits: { gasMaxMicroamps: 0.2 } })
        .expect(200);
    }
  });

  it('aborts over REST (technician), answers 409 once ended, and audits both', async () => {
    const bridge = await benchWithExtensions(hub);
    open.push(bridge);
    const tech = await hub.token('tech');
    const { body } = await post(hub, { benchId: bridge.benchId, valveType: '12AX7' });
    const start: StartCheck = await bridge.next('start-check');
    bridge.send({ type: 'check-started', checkId: start.checkId });
    await hub.api
      .post(`/api/quick-tests/${body.id}/abort`)
      .set('authorization', `Bearer ${tech}`)
      .expect(202);
    await bridge.next('abort-check');
    bridge.send({
      type: 'check-ended',
      checkId: start.checkId,
      reason: 'aborted',
      message: 'aborted on request',
      errorCode: null,
      readings: [],
    });
    await eventually(async () => (await get(hub, body.id)).status === 'aborted', 'aborted');
    const again = await hub.api
      .post(`/api/quick-tests/${body.id}/abort`)
      .set('authorization', `Bearer ${tech}`);
    expect(again.status).toBe(409);
    const audit = await hub.api
      .get('/api/audit?action=quickTest.abort')
      .set('authorization', `Bearer ${await hub.token('admin')}`)
      .expect(200);
    expect(
      audit.body.items.some((e: { subject: string }) => e.subject === `quick-test:${body.id}`),
    ).toBe(true);
  });
});
