import { afterEach, describe, expect, it } from 'vitest';
import { PROTOCOL_VERSION } from '../../shared/protocol/messages';
import { FAKE_CAPS, FakeTracer } from './fake-tracer';
import { openTestBench, SAFE_PLAN, TEST_TOKEN, type TestBench } from './test-bench';
import { until } from './until';

let bench: TestBench | null = null;
afterEach(async () => {
  await bench?.close();
  bench = null;
});

describe('bridge handshake', () => {
  it('identifies the tracer over a serial pty and announces its capabilities to the hub', async () => {
    bench = await openTestBench();
    await bench.ready();
    const { tracer, hub, bridge } = bench;

    expect(tracer.received[0].command).toEqual({ type: 'identify' });
    expect(bridge.capabilities).toEqual({
      protocolVersion: PROTOCOL_VERSION,
      model: 'TEST-TRACER',
      serial: 'T-0001',
      firmware: '0.9',
      ...FAKE_CAPS,
    });
    const hello = await hub.waitFor('hello', (m) => m.capabilities !== null);
    expect(hello.capabilities).toEqual(bridge.capabilities);
    expect(hello.bridgeVersion).toMatch(/^\d+\.\d+\.\d+$/);
    expect(hub.authHeaders).toContain(`Bearer ${TEST_TOKEN}`);
    // A fresh link starts from a known state: outputs off, then a status request.
    await tracer.waitFor('status');
    const afterIdentify = tracer.received.slice(1).map((r) => r.command.type);
    expect(afterIdentify.slice(0, 2)).toEqual(['off', 'status']);
  });

  it("feeds the tracer's watchdog with a keep-alive every second", async () => {
    bench = await openTestBench();
    await bench.ready();
    await bench.tracer.waitFor('keepalive', 3, 5000);
    const times = bench.tracer.received
      .filter((r) => r.command.type === 'keepalive')
      .map((r) => r.atMs);
    for (let i = 1; i < times.length; i++) {
      expect(times[i] - times[i - 1]).toBeGreaterThanOrEqual(900);
      expect(times[i] - times[i - 1]).toBeLessThan(2000);
    }
  });

  it('repeats the identify when the tracer does not answer the first one', async () => {
    bench = await openTestBench({
      tracer: { ignoreIdentifies: 1 },
      bridge: { handshakeTimeoutMs: 200 },
    });
    await bench.ready();
    expect(bench.tracer.commands('identify')).toHaveLength(2);
  });

  it('refuses a tracer that speaks another protocol version, with a clear log line', async () => {
    bench = await openTestBench({ tracer: { protocolVersion: PROTOCOL_VERSION + 1 } });
    const { tracer, hub, bridge, logs } = bench;
    const line = await until('refusal logged', () =>
      logs.find((l) => l.includes(`protocol version ${PROTOCOL_VERSION + 1}`)),
    );
    expect(line).toContain(`speaks version ${PROTOCOL_VERSION} only`);
    await until('hub connected', () => hub.clientConnected);
    expect(bridge.deviceReady).toBe(false);
    expect(bridge.capabilities).toBeNull();
    expect(hub.messages('hello')[0].capabilities).toBeNull();
    expect(new Set(tracer.received.map((r) => r.command.type))).toEqual(new Set(['identify']));

    hub.send({ type: 'start-sweep', sweepId: 1, plan: SAFE_PLAN });
    const refused = await hub.waitFor('sweep-refused');
    expect(refused.message).toContain('not connected');
    expect(tracer.commands('sweep')).toHaveLength(0);
  });

  it('reaches a tracer over TCP as well', async () => {
    bench = await openTestBench({ tcp: true });
    await bench.ready();
    expect(bench.bridge.capabilities?.model).toBe('TEST-TRACER');
    await bench.tracer.waitFor('off');
  });

  it('notices an unplugged tracer, ends the running sweep as link-lost, and reconnects', async () => {
    bench = await openTestBench();
    await bench.ready();
    const { hub, pair } = bench;
    hub.send({ type: 'start-sweep', sweepId: 7, plan: SAFE_PLAN });
    await hub.waitFor('sweep-started');
    bench.tracer.point(0, 0);
    bench.tracer.point(10, 0.1);
    await until('2 points at the hub', () => hub.seqsReceived(7).length === 2);

    await bench.tracer.close();
    await pair!.unplug();
    const ended = await hub.waitFor('sweep-ended');
    expect(ended).toMatchObject({ sweepId: 7, reason: 'link-lost', count: 2 });
    expect(ended.message).toContain('serial link');
    await hub.waitFor('status', (m) => !m.status.deviceOnline);
    expect(bench.logs.some((l) => l.includes('disconnected'))).toBe(true);

    await pair!.plug();
    bench.tracer = await FakeTracer.serial(pair!.device);
    await until('bridge ready again', () => bench!.bridge.deviceReady, 5000);
    await bench.tracer.waitFor('off');
    expect(bench.tracer.commands('identify').length).toBeGreaterThanOrEqual(1);
  });
});
