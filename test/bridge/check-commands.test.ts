import { afterEach, describe, expect, it } from 'vitest';
import type { CheckPlan, DeviceExtensions } from '../../shared/protocol/check-plan';
import { openTestBench, SAFE_PLAN, type TestBench, type TestBenchOptions } from './test-bench';
import { until } from './until';

const EXTENSIONS: DeviceExtensions = {
  features: ['leakage', 'emission', 'grid-current'],
  gridFeedKiloohms: 47,
  leakageMaxVolts: 200,
};

const LEAKAGE: CheckPlan = {
  kind: 'leakage',
  heaterVolts: 12.6,
  warmupSeconds: 0,
  settleMs: 0,
  pairs: [
    { pair: 'heater-cathode', volts: 100 },
    { pair: 'anode-cathode', volts: 100 },
  ],
};

const GRID: CheckPlan = {
  kind: 'grid-current',
  vaVolts: 250,
  vg1Volts: -2,
  vg2Volts: 0,
  heaterVolts: 12.6,
  iaTripMilliamps: 5,
  paMaxWatts: 1,
  warmupSeconds: 0,
  settleMs: 0,
};

const GM: CheckPlan = {
  kind: 'transfer',
  plan: {
    ...SAFE_PLAN,
    kind: 'transfer',
    vaStartVolts: 250,
    vaStopVolts: 250,
    vg1Volts: [-2.1, -2, -1.9],
  },
};

let bench: TestBench | null = null;
afterEach(async () => {
  await bench?.close();
  bench = null;
});

/** A bench on TCP with a tracer that has the optional functions, once they are announced. */
async function ready(o: TestBenchOptions = {}): Promise<TestBench> {
  bench = await openTestBench({ tcp: true, ...o, tracer: { extensions: EXTENSIONS, ...o.tracer } });
  await bench.ready();
  if (bench.tracer.options.extensions) await until('extensions', () => bench!.bridge.extensions);
  return bench;
}

async function started(b: TestBench, checkId: number, check: CheckPlan): Promise<void> {
  b.hub.send({ type: 'start-check', checkId, check });
  await b.hub.waitFor('check-started', (m) => m.checkId === checkId);
}

describe('bridge and section 2 of a double triode', () => {
  it('sends a section-2 plan to a tracer with a section switch, and refuses it to one without', async () => {
    const withSwitch = await ready({
      tracer: {
        extensions: { ...EXTENSIONS, features: [...EXTENSIONS.features, 'section-select'] },
      },
    });
    const plan = { ...SAFE_PLAN, section: 2 as const };
    withSwitch.hub.send({ type: 'start-sweep', sweepId: 31, plan });
    await withSwitch.hub.waitFor('sweep-started', (m) => m.sweepId === 31);
    expect(withSwitch.tracer.commands('sweep')[0]).toEqual({ type: 'sweep', sweepId: 31, plan });
    await withSwitch.close();
    bench = null;

    const without = await ready();
    without.hub.send({ type: 'start-sweep', sweepId: 32, plan });
    const refused = await without.hub.waitFor('sweep-refused', (m) => m.sweepId === 32);
    expect(refused.message).toContain('no section switch');
    without.hub.send({ type: 'outputs-off' });
    await without.tracer.waitFor('off');
    expect(without.tracer.commands('sweep')).toHaveLength(0);
  });
});

describe('bridge checks (quick-test steps)', () => {
  it('asks the tracer for its optional functions and announces them in a repeated hello', async () => {
    const b = await ready();
    await b.tracer.waitFor('extensions');
    const hello = await b.hub.waitFor('hello', (m) => m.extensions != null);
    expect(hello.extensions).toEqual(EXTENSIONS);
    // OFF comes first on every new session; the question after it.
    expect(b.tracer.positions('off').first).toBeLessThan(b.tracer.positions('extensions').first);
  });

  it('announces none for a core-only tracer and refuses what needs them, sending nothing', async () => {
    bench = await openTestBench({ tcp: true });
    await bench.ready();
    const b = bench;
    await b.tracer.waitFor('extensions');
    b.hub.send({ type: 'start-check', checkId: 5, check: LEAKAGE });
    const refused = await b.hub.waitFor('check-refused');
    expect(refused).toMatchObject({ checkId: 5 });
    expect(refused.message).toContain('the tracer has no leakage function');
    expect(b.hub.messages('hello').every((h) => h.extensions == null)).toBe(true);
    expect(b.tracer.commands('leakage')).toHaveLength(0);
  });

  it('runs a leakage check: LKG out, readings forwarded, the end with every reading', async () => {
    const b = await ready();
    await started(b, 31, LEAKAGE);
    expect(b.tracer.commands('leakage')[0]).toEqual({
      type: 'leakage',
      checkId: 31,
      plan: {
        heaterVolts: 12.6,
        warmupSeconds: 0,
        settleMs: 0,
        pairs: (LEAKAGE as { pairs: unknown }).pairs,
      },
    });
    await until('status with the check id', () =>
      b.hub.messages('status').some((s) => s.status.checkId === 31),
    );
    b.tracer.checkResult({
      type: 'leakage',
      pair: 'heater-cathode',
      volts: 100,
      microamps: 0.06,
      overRange: false,
    });
    b.tracer.checkResult({
      type: 'leakage',
      pair: 'anode-cathode',
      volts: 100,
      microamps: 500,
      overRange: true,
    });
    b.tracer.finishCheck();
    const ended = await b.hub.waitFor('check-ended');
    expect(ended).toMatchObject({ checkId: 31, reason: 'complete', errorCode: null });
    expect(ended.readings).toEqual([
      { kind: 'leakage', pair: 'heater-cathode', volts: 100, microamps: 0.06, overRange: false },
      { kind: 'leakage', pair: 'anode-cathode', volts: 100, microamps: 500, overRange: true },
    ]);
    expect(b.hub.messages('check-reading')).toHaveLength(2);
    expect(b.bridge.activeCheckId).toBeNull();
    // Checks are not journaled: the journal holds sweeps only.
    expect(b.bridge.journal.list()).toEqual([]);
  });

  it("refuses a check beyond the tracer's limits before anything reaches the tracer", async () => {
    const b = await ready();
    const high = { ...LEAKAGE, pairs: [{ pair: 'anode-cathode' as const, volts: 300 }] };
    b.hub.send({ type: 'start-check', checkId: 32, check: high });
    const refused = await b.hub.waitFor('check-refused');
    expect(refused.message).toContain(
      "test voltage 300 V of anode-cathode is above the tracer's 200 V",
    );
    b.hub.send({ type: 'start-check', checkId: 33, check: { ...GRID, vaVolts: 600 } });
    expect((await b.hub.waitFor('check-refused', (m) => m.checkId === 33)).message).toContain(
      'anode voltage 600 V is above the limit of 500 V',
    );
    expect(b.tracer.commands('leakage')).toHaveLength(0);
    expect(b.tracer.commands('grid-current')).toHaveLength(0);
  });

  it('runs a transfer check as a plain SWP and reports its points as readings', async () => {
    const b = await ready();
    await started(b, 34, GM);
    expect(b.tracer.commands('sweep')[0]).toMatchObject({
      sweepId: 34,
      plan: { kind: 'transfer' },
    });
    b.tracer.point(250, 0.8, 0, 0);
    b.tracer.point(250, 0.96, 1, 0);
    b.tracer.point(250, 1.12, 2, 0);
    b.tracer.finish('complete');
    const ended = await b.hub.waitFor('check-ended');
    expect(ended.readings.map((r) => r.kind === 'point' && r.iaMilliamps)).toEqual([
      0.8, 0.96, 1.12,
    ]);
    expect(b.hub.messages('points')).toHaveLength(0);
    expect(b.hub.messages('sweep-ended')).toHaveLength(0);
  });

  it("switches outputs off itself and reports 'limit' on a reading beyond the check's trip", async () => {
    const b = await ready();
    await started(b, 35, GRID);
    b.tracer.checkResult({
      type: 'grid-current',
      vaVolts: 250,
      vg1Volts: -2,
      vg2Volts: 0,
      iaMilliamps: 6,
      ig1Microamps: -0.01,
      gridKiloohms: 47,
    });
    const ended = await b.hub.waitFor('check-ended');
    expect(ended).toMatchObject({ checkId: 35, reason: 'limit' });
    expect(ended.message).toContain('Ia 6 mA at 250 V');
    expect(ended.readings).toHaveLength(1);
    await until(
      'OFF after the check',
      () => b.tracer.positions('off').last > b.tracer.positions('grid-current').first,
    );
  });

  it('runs one thing at a time: no sweep during a check, no check during a sweep', async () => {
    const b = await ready();
    await started(b, 36, LEAKAGE);
    b.hub.send({ type: 'start-sweep', sweepId: 37, plan: SAFE_PLAN });
    expect((await b.hub.waitFor('sweep-refused')).message).toContain(
      'busy with quick-test check 36',
    );
    b.tracer.finishCheck('complete', 0);
    await b.hub.waitFor('check-ended');
    b.hub.send({ type: 'start-sweep', sweepId: 38, plan: SAFE_PLAN });
    await b.hub.waitFor('sweep-started');
    b.hub.send({ type: 'start-check', checkId: 39, check: LEAKAGE });
    expect((await b.hub.waitFor('check-refused')).message).toContain('busy with sweep 38');
  });

  it('aborts a running check with ABT, and an unknown one by switching outputs off', async () => {
    const b = await ready();
    await started(b, 40, LEAKAGE);
    b.hub.send({ type: 'abort-check', checkId: 40 });
    const ended = await b.hub.waitFor('check-ended');
    expect(ended).toMatchObject({ checkId: 40, reason: 'aborted', message: 'aborted on request' });
    expect(b.tracer.commands('abort')).toEqual([{ type: 'abort', sweepId: 40 }]);
    const offs = b.tracer.commands('off').length;
    b.hub.send({ type: 'abort-check', checkId: 99 });
    await b.tracer.waitFor('off', offs + 1);
  });

  it("ends a check 'fault' with the tracer's error code, even when the ERR follows the END", async () => {
    const b = await ready();
    await started(b, 41, GRID);
    b.tracer.finishCheck('fault');
    b.tracer.send({ type: 'error', code: 'E31', text: 'short circuit at the electrode check' });
    const ended = await b.hub.waitFor('check-ended');
    expect(ended).toMatchObject({ checkId: 41, reason: 'fault', errorCode: 'E31' });
    expect(ended.message).toContain('E31 short circuit');
  });

  it("reports the tracer's refusal, and refuses a malformed start without running it", async () => {
    const b = await ready({ tracer: { refuseCheck: { code: 'E21', text: 'test voltage' } } });
    b.hub.send({ type: 'start-check', checkId: 42, check: LEAKAGE });
    expect((await b.hub.waitFor('check-refused')).message).toContain('E21 test voltage');
    b.hub.send({ type: 'start-check', checkId: 43, check: { ...LEAKAGE, pairs: [] } as CheckPlan });
    expect((await b.hub.waitFor('check-refused', (m) => m.checkId === 43)).message).toContain(
      'malformed',
    );
    expect(b.tracer.commands('leakage')).toHaveLength(1);
  });

  it('switches the outputs off and drops the check when the hub is lost', async () => {
    const b = await ready();
    await started(b, 44, LEAKAGE);
    const offs = b.tracer.commands('off').length;
    b.hub.dropClient();
    await b.tracer.waitFor('off', offs + 1);
    await until('check dropped', () => b.bridge.activeCheckId === null);
  });
});
