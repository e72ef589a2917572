import { afterEach, describe, expect, it } from 'vitest';
import { openTestBench, SAFE_PLAN, TEST_TOKEN, type TestBench } from './test-bench';
import { until } from './until';

let bench: TestBench | null = null;
afterEach(async () => {
  await bench?.close();
  bench = null;
});

async function running(b: TestBench, sweepId: number): Promise<void> {
  await b.ready();
  b.hub.send({ type: 'start-sweep', sweepId, plan: SAFE_PLAN });
  await b.hub.waitFor('sweep-started', (m) => m.sweepId === sweepId);
}

function isIncreasing(xs: number[]): boolean {
  return xs.every((x, i) => i === 0 || x > xs[i - 1]);
}

describe('bridge hub link', () => {
  it("switches the tracer's outputs off as soon as the hub is lost", async () => {
    bench = await openTestBench();
    const { hub, tracer, bridge } = bench;
    await running(bench, 21);
    tracer.point(0, 0);
    await until('point at the hub', () => hub.seqsReceived(21).length === 1);
    const offsBefore = tracer.commands('off').length;

    hub.down = true;
    hub.dropClient();
    await tracer.waitFor('off', offsBefore + 1);
    expect(bridge.activeSweepId).toBeNull();
    expect(bridge.journal.get(21)?.end).toMatchObject({ reason: 'link-lost', count: 1 });

    // The end was journaled while the hub was away, and is reported once it is back.
    hub.down = false;
    const ended = await hub.waitFor('sweep-ended');
    expect(ended).toMatchObject({ sweepId: 21, reason: 'link-lost', count: 1 });
    expect(ended.message).toContain('lost the hub connection');
    await until('journal emptied by the acks', () => bridge.journal.list().length === 0);
  });

  it('resends unacknowledged points after the hub reconnects, and not the acknowledged ones', async () => {
    bench = await openTestBench();
    const { hub, tracer, bridge } = bench;
    await running(bench, 22);
    for (let i = 0; i < 10; i++) tracer.point(i, 0.01 * i);
    await until('10 points acknowledged', () => bridge.journal.get(22)?.ackedThroughSeq === 9);

    hub.autoAck = false;
    for (let i = 10; i < 260; i++) tracer.point(i, 0.01 * i);
    await until('260 points at the hub', () => hub.seqsReceived(22).length === 260);
    hub.autoAck = true;
    hub.dropClient();

    await hub.waitFor('sweep-ended');
    expect(hub.connections).toBe(2);
    const resent = hub.seqsReceived(22, 2);
    expect(resent).toEqual(Array.from({ length: 250 }, (_, i) => i + 10));
    // Batches hold at most 200 points.
    expect(Math.max(...hub.messages('points').map((m) => m.points.length))).toBeLessThanOrEqual(
      200,
    );
    // Every seq exactly once after dedupe, and in order on each connection.
    expect([...hub.stored.get(22)!.keys()]).toEqual(Array.from({ length: 260 }, (_, i) => i));
    expect(isIncreasing(hub.seqsReceived(22, 1))).toBe(true);
    expect(isIncreasing(resent)).toBe(true);
    // The end comes after the last point of its sweep.
    const second = hub.received.filter((r) => r.connection === 2).map((r) => r.message.type);
    expect(second.lastIndexOf('points')).toBeLessThan(second.indexOf('sweep-ended'));
    expect(second[0]).toBe('hello');
    await until('journal emptied by the acks', () => bridge.journal.list().length === 0);
  });

  it('drops a hub that stops answering pings, and switches outputs off', async () => {
    bench = await openTestBench({ bridge: { pingIntervalMs: 50, pongTimeoutMs: 200 } });
    const { hub, tracer } = bench;
    await bench.ready();
    const offsBefore = tracer.commands('off').length;
    hub.freezeClient();
    await until('pong timeout logged', () => bench!.logs.find((l) => l.includes('no pong')));
    await tracer.waitFor('off', offsBefore + 1);
    await until('second connection', () => hub.connections === 2 && hub.clientConnected);
  });

  it('sends the bench token as a bearer header and keeps retrying while the hub refuses it', async () => {
    bench = await openTestBench();
    const { hub } = bench;
    hub.token = 'some-other-token';
    hub.dropClient();
    await until('refusal logged', () => bench!.logs.find((l) => l.includes('401')));
    expect(bench.logs.find((l) => l.includes('401'))).toContain('bench token');
    const tries = hub.authHeaders.length;
    await until('more tries', () => hub.authHeaders.length >= tries + 2);
    hub.token = TEST_TOKEN;
    await until('accepted again', () => hub.clientConnected);
    expect(new Set(hub.authHeaders)).toEqual(new Set([`Bearer ${TEST_TOKEN}`]));
  });

  it("reports the tracer's heartbeat and line counters in status messages", async () => {
    bench = await openTestBench();
    const { hub, tracer } = bench;
    await bench.ready();
    tracer.heaterVolts = 6.3;
    tracer.beat();
    const status = await hub.waitFor('status', (m) => m.status.heaterVolts === 6.3);
    expect(status.status).toMatchObject({
      deviceOnline: true,
      state: 'idle',
      highVoltage: false,
      sweepId: null,
    });
    expect(status.status.lineStats.accepted).toBeGreaterThan(0);
  });
});
