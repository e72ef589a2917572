import { afterEach, describe, expect, it } from 'vitest';
import { frame } from '../../shared/protocol/checksum';
import { droppedCount, MAX_LINE_BYTES } from '../../shared/protocol/line-reader';
import { openTestBench, SAFE_PLAN, type TestBench, type TestBenchOptions } from './test-bench';
import { until } from './until';

let bench: TestBench | null = null;
afterEach(async () => {
  await bench?.close();
  bench = null;
});

async function ready(o: TestBenchOptions = {}): Promise<TestBench> {
  bench = await openTestBench(o);
  await bench.ready();
  return bench;
}

async function started(b: TestBench, sweepId: number): Promise<void> {
  b.hub.send({ type: 'start-sweep', sweepId, plan: SAFE_PLAN });
  await b.hub.waitFor('sweep-started', (m) => m.sweepId === sweepId);
}

describe('bridge sweep commands', () => {
  it("refuses a plan beyond the tracer's limits before anything reaches the tracer", async () => {
    const { hub, tracer } = await ready();
    const plan = { ...SAFE_PLAN, vaStopVolts: 600, heaterVolts: 20 };
    hub.send({ type: 'start-sweep', sweepId: 3, plan });

    const refused = await hub.waitFor('sweep-refused');
    expect(refused.sweepId).toBe(3);
    expect(refused.message).toContain('anode voltage 600 V is above the limit of 500 V');
    expect(refused.message).toContain('heater voltage 20 V is above the limit of 13.2 V');
    // A later, harmless command proves the tracer has read everything sent before it.
    hub.send({ type: 'outputs-off' });
    await tracer.waitFor('off', 2);
    expect(tracer.commands('sweep')).toHaveLength(0);
    expect(tracer.commands('heater')).toHaveLength(0);
  });

  it('refuses a malformed start-sweep without running it', async () => {
    const { hub, tracer } = await ready();
    hub.send({
      type: 'start-sweep',
      sweepId: 4,
      plan: { ...SAFE_PLAN, kind: 'sideways' } as never,
    });
    const refused = await hub.waitFor('sweep-refused');
    expect(refused.message).toContain('plan.kind');
    expect(tracer.commands('sweep')).toHaveLength(0);
  });

  it('sets the heater, sends the plan, forwards the points and reports the end', async () => {
    const b = await ready();
    await started(b, 11);
    const sent = b.tracer.commands('sweep')[0];
    expect(sent).toEqual({ type: 'sweep', sweepId: 11, plan: SAFE_PLAN });
    const order = b.tracer.received
      .map((r) => r.command.type)
      .filter((t) => t === 'heater' || t === 'sweep');
    expect(order).toEqual(['heater', 'sweep']);
    expect(b.tracer.commands('heater')[0].volts).toBe(12.6);

    for (let i = 0; i < 5; i++) b.tracer.point(i * 10, i * 0.2);
    b.tracer.finish('complete');
    const ended = await b.hub.waitFor('sweep-ended');
    expect(ended).toMatchObject({ sweepId: 11, reason: 'complete', count: 5 });
    expect(b.hub.seqsReceived(11)).toEqual([0, 1, 2, 3, 4]);
    const stored = b.hub.stored.get(11)!;
    expect(stored.get(3)).toEqual({
      seq: 3,
      curve: 0,
      vaVolts: 30,
      vg1Volts: 0,
      vg2Volts: 0,
      iaMilliamps: 0.6,
      ig2Milliamps: 0,
    });
  });

  it('skips the heater command when the heater already runs at the plan voltage', async () => {
    const b = await ready();
    await started(b, 1);
    b.tracer.finish('complete', 0);
    await b.hub.waitFor('sweep-ended');
    b.tracer.beat();
    await until('heartbeat with the heater on', () => b.bridge.status.heaterVolts === 12.6);
    await started(b, 2);
    expect(b.tracer.commands('heater')).toHaveLength(1);
    expect(b.tracer.commands('sweep')).toHaveLength(2);
  });

  it("reports the tracer's own refusal of a plan", async () => {
    const b = await ready({ tracer: { refuseSweep: { code: 'E21', text: 'anode range' } } });
    b.hub.send({ type: 'start-sweep', sweepId: 5, plan: SAFE_PLAN });
    const refused = await b.hub.waitFor('sweep-refused');
    expect(refused.message).toContain('E21 anode range');
    expect(b.hub.messages('sweep-started')).toHaveLength(0);
    expect(b.bridge.activeSweepId).toBeNull();
  });

  it('refuses the sweep and switches outputs off when the tracer never answers the start', async () => {
    const b = await ready({ tracer: { silentOnSweep: true }, bridge: { commandTimeoutMs: 200 } });
    b.hub.send({ type: 'start-sweep', sweepId: 6, plan: SAFE_PLAN });
    const refused = await b.hub.waitFor('sweep-refused');
    expect(refused.message).toContain('did not answer the start command');
    await b.tracer.waitFor('off', 2);
  });

  it("switches outputs off itself and reports 'limit' on a reading beyond the trip", async () => {
    const b = await ready();
    await started(b, 8);
    b.tracer.point(100, 2);
    // 8 mA is above the plan's 7.5 mA trip; the fake tracer itself does not trip.
    b.tracer.point(110, 8);
    const ended = await b.hub.waitFor('sweep-ended');
    expect(ended).toMatchObject({ sweepId: 8, reason: 'limit', count: 2 });
    expect(ended.message).toContain('Ia 8 mA at Va 110 V');
    await until('OFF after the sweep command', () => {
      return b.tracer.positions('off').last > b.tracer.positions('sweep').first;
    });
    // The tripping reading itself is kept: it shows the technician what happened.
    expect(b.hub.seqsReceived(8)).toEqual([0, 1]);
  });

  it("reports 'limit' on a dissipation beyond the trip margin even below the trip current", async () => {
    const b = await ready();
    await started(b, 9);
    // 300 V x 5 mA = 1.5 W is at the margin of 1.5 x 1 W (no trip); 1.53 W is beyond it.
    b.tracer.point(300, 5);
    b.tracer.point(300, 5.1);
    const ended = await b.hub.waitFor('sweep-ended');
    expect(ended).toMatchObject({ reason: 'limit', count: 2 });
  });

  it("ends the sweep as 'fault' naming the point lost on the serial link", async () => {
    const b = await ready();
    await started(b, 12);
    b.tracer.point(0, 0);
    b.tracer.point(10, 0.1);
    const lost = frame('PT,12,2,0,20,0,0,0.2,0');
    b.tracer.sendRaw(lost.replace('0.2', '0.3')); // corrupted on the way: checksum fails
    b.tracer.point(30, 0.3, 3);
    const ended = await b.hub.waitFor('sweep-ended');
    expect(ended).toMatchObject({ sweepId: 12, reason: 'fault', count: 2 });
    expect(ended.message).toContain('lost point 2 on the serial link');
    expect(b.hub.seqsReceived(12)).toEqual([0, 1]);
    expect(b.bridge.status.lineStats.badChecksum).toBe(1);
    await until('OFF after the sweep command', () => {
      return b.tracer.positions('off').last > b.tracer.positions('sweep').first;
    });
  });

  it("reports 'fault' when the last points of a sweep never arrive", async () => {
    const b = await ready();
    await started(b, 13);
    b.tracer.point(0, 0);
    b.tracer.finish('complete', 3);
    const ended = await b.hub.waitFor('sweep-ended');
    expect(ended).toMatchObject({ reason: 'fault', count: 1 });
    expect(ended.message).toContain('lost points 1 to 2 on the serial link');
  });

  it("names the tracer's error in the end message, also when the ERR follows the END", async () => {
    const b = await ready();
    await started(b, 20);
    b.tracer.point(0, 0);
    b.tracer.finish('fault');
    b.tracer.send({ type: 'error', code: 'E31', text: 'short between grid and cathode' });
    const ended = await b.hub.waitFor('sweep-ended');
    expect(ended).toMatchObject({ sweepId: 20, reason: 'fault', count: 1 });
    expect(ended.message).toContain('E31 short between grid and cathode');

    await started(b, 21);
    b.tracer.send({ type: 'error', code: 'E20', text: 'over-limit reading' });
    b.tracer.finish('limit');
    const tripped = await b.hub.waitFor('sweep-ended', (m) => m.sweepId === 21);
    expect(tripped).toMatchObject({ reason: 'limit', count: 0 });
    expect(tripped.message).toContain('E20 over-limit reading');
  });

  it('counts corrupted device lines in lineStats and never turns them into points', async () => {
    const b = await ready();
    await started(b, 14);
    b.tracer.point(0, 0);
    const good = frame('PT,14,1,0,10,0,0,0.1,0');
    b.tracer.sendRaw(good.replace('0.1', '0.2')); // a bit flipped: checksum fails
    b.tracer.sendRaw('$PT,14,9,0,10,0,0,0.1,0\r\n'); // no checksum at all
    b.tracer.sendRaw(frame('PT,14,9,0,10,0,0,0.1')); // checksum fine, a field missing
    b.tracer.sendRaw(`$${'9'.repeat(MAX_LINE_BYTES + 10)}*00\r\n`); // overlong
    b.tracer.sendRaw('$PT,14,9,0,1\u00ff0,0,0,0.1,0*00\r\n'); // a byte outside ASCII
    b.tracer.sendRaw('~~noise~~');
    b.tracer.sendRaw('$PT,14,9,0,1'); // cut short by the next frame's '$'
    b.tracer.point(10, 0.1);
    b.tracer.finish('complete');

    const ended = await b.hub.waitFor('sweep-ended');
    expect(ended).toMatchObject({ reason: 'complete', count: 2 });
    expect(b.hub.seqsReceived(14)).toEqual([0, 1]);
    b.tracer.beat();
    const status = await b.hub.waitFor('status', (m) => droppedCount(m.status.lineStats) >= 6);
    expect(status.status.lineStats).toMatchObject({
      badChecksum: 2,
      malformed: 1,
      overlong: 1,
      badBytes: 1,
      truncated: 1,
    });
    expect(status.status.lineStats.noiseBytes).toBeGreaterThanOrEqual('~~noise~~'.length);
  });

  it('aborts on request with ABT and reports the sweep aborted', async () => {
    const b = await ready();
    await started(b, 15);
    b.tracer.point(0, 0);
    b.hub.send({ type: 'abort-sweep', sweepId: 15 });
    const ended = await b.hub.waitFor('sweep-ended');
    expect(b.tracer.commands('abort')).toEqual([{ type: 'abort', sweepId: 15 }]);
    expect(ended).toMatchObject({ sweepId: 15, reason: 'aborted', count: 1 });
    expect(ended.message).toContain('aborted on request');
  });

  it('switches outputs off on request and ends the running sweep', async () => {
    const b = await ready();
    await started(b, 16);
    const offsBefore = b.tracer.commands('off').length;
    b.hub.send({ type: 'outputs-off' });
    await b.tracer.waitFor('off', offsBefore + 1);
    const ended = await b.hub.waitFor('sweep-ended');
    expect(ended).toMatchObject({ sweepId: 16, reason: 'aborted', count: 0 });
  });

  it('refuses a second sweep while one runs', async () => {
    const b = await ready();
    await started(b, 17);
    b.hub.send({ type: 'start-sweep', sweepId: 18, plan: SAFE_PLAN });
    const refused = await b.hub.waitFor('sweep-refused');
    expect(refused).toMatchObject({ sweepId: 18 });
    expect(refused.message).toContain('busy with sweep 17');
    expect(b.bridge.activeSweepId).toBe(17);
  });

  it('ignores a repeated start of the sweep that runs', async () => {
    const b = await ready();
    await started(b, 23);
    b.hub.send({ type: 'start-sweep', sweepId: 23, plan: SAFE_PLAN });
    await until('repeat logged', () => b.logs.find((l) => l.includes('ignoring a repeated start')));
    expect(b.bridge.activeSweepId).toBe(23);
    expect(b.tracer.commands('sweep')).toHaveLength(1);
    expect(b.hub.messages('sweep-refused')).toHaveLength(0);
    b.tracer.point(0, 0);
    b.tracer.finish('complete');
    expect(await b.hub.waitFor('sweep-ended')).toMatchObject({ sweepId: 23, reason: 'complete' });
  });

  it("ends the sweep as 'fault' when the tracer goes idle without an end line", async () => {
    const b = await ready();
    await started(b, 19);
    b.tracer.point(0, 0);
    // The END line is lost: the tracer is idle, and says so in its heartbeats.
    b.tracer.state = 'idle';
    b.tracer.sweep = null;
    b.tracer.beat();
    b.tracer.beat();
    const ended = await b.hub.waitFor('sweep-ended');
    expect(ended).toMatchObject({ sweepId: 19, reason: 'fault', count: 1 });
    expect(ended.message).toContain('without an end of sweep');
  });
});
