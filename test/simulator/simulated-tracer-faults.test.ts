import { describe, expect, it } from 'vitest';
import type { SweepPlan } from '../../shared/domain/sweep';
import type { FaultName } from '../../simulator/fault-name';
import { manualBench, type ManualBench } from './bench';
import { line, smallTriodePlan, sweepLine } from './test-host';

const PLAN_MS = 120_000;

/** Runs one sweep of `plan` on a fresh bench with `fault` and returns the bench. */
function sweepWith(fault: FaultName, plan: SweepPlan, valve = '12AX7#5'): ManualBench {
  const b = manualBench({ valve, fault });
  b.send(sweepLine(1, plan));
  b.run(PLAN_MS);
  return b;
}

function iaBySetting(b: ManualBench, sweepId = 1): Map<string, number> {
  return new Map(
    b.host
      .of('point')
      .filter((p) => p.sweepId === sweepId)
      .map((p) => [`${p.vg1Volts}/${p.vaVolts}`, p.iaMilliamps]),
  );
}

describe('SimulatedTracer faults', () => {
  it('short: refuses high voltage after the electrode check with END FAULT and ERR E31', () => {
    const b = sweepWith('short', smallTriodePlan());
    expect(b.host.of('point')).toEqual([]);
    expect(b.host.of('end')).toEqual([{ type: 'end', sweepId: 1, reason: 'fault', count: 0 }]);
    expect(b.host.of('error').map((e) => e.code)).toEqual(['E31']);
    b.send(line({ type: 'status' }));
    expect(b.host.of('heartbeat').at(-1)).toMatchObject({
      state: 'fault',
      highVoltage: false,
      heaterVolts: 0,
    });
  });

  it('short set during a sweep: trips at once, and the next sweep stops at the electrode check', () => {
    const b = manualBench({ valve: '12AX7#5' });
    b.send(sweepLine(1, smallTriodePlan({ settleMs: 50 })));
    b.run(31_000);
    const before = b.host.of('point').length;
    expect(before).toBeGreaterThan(0);
    b.tracer.setFault('short');
    b.run(1000);
    // Above 20 V an over-range reading is reported at full scale and trips the sweep.
    const last = b.host.of('point').at(-1)!;
    expect(last.iaMilliamps).toBe(250);
    expect(b.host.of('end')[0]).toMatchObject({ sweepId: 1, reason: 'limit', count: before + 1 });
    b.send(sweepLine(2, smallTriodePlan()));
    b.run(PLAN_MS);
    expect(b.host.of('end')[1]).toMatchObject({ sweepId: 2, reason: 'fault', count: 0 });
    expect(b.host.of('error').map((e) => e.code)).toEqual(['E20', 'E31']);
  });

  it('open heater: END FAULT and ERR E30 at sweep start, NAK E30 on HTR', () => {
    const b = sweepWith('open-heater', smallTriodePlan());
    expect(b.host.of('ack')[0]).toMatchObject({ command: 'SWP', sweepId: 1 });
    expect(b.host.of('end')).toEqual([{ type: 'end', sweepId: 1, reason: 'fault', count: 0 }]);
    expect(b.host.of('error').map((e) => e.code)).toEqual(['E30']);
    b.send(line({ type: 'heater', volts: 12.6 }));
    expect(b.host.of('nak').at(-1)).toMatchObject({ command: 'HTR', code: 'E30' });
  });

  it('low emission: currents about half those of the same valve without the fault', () => {
    const plan = smallTriodePlan({ vg1Volts: [-1, -1.5, -2] });
    const sound = iaBySetting(sweepWith('none', plan));
    const low = iaBySetting(sweepWith('low-emission', plan));
    const ratios = [...sound].filter(([, ia]) => ia > 0.1).map(([k, ia]) => low.get(k)! / ia);
    expect(ratios.length).toBeGreaterThan(10);
    expect(Math.min(...ratios)).toBeGreaterThan(0.45);
    expect(Math.max(...ratios)).toBeLessThan(0.55);
  });

  it('worn cathode: a 10 % heater reduction collapses the current, a sound one hardly moves', () => {
    const at = (fault: FaultName, heaterVolts: number) =>
      sweepWith(
        fault,
        smallTriodePlan({
          vaStartVolts: 250,
          vaStopVolts: 250,
          vg1Volts: [-2],
          heaterVolts,
          warmupSeconds: 60,
        }),
      ).host.of('point')[0].iaMilliamps;
    const soundDrop = at('none', 11.34) / at('none', 12.6);
    const wornDrop = at('worn-cathode', 11.34) / at('worn-cathode', 12.6);
    expect(soundDrop).toBeGreaterThan(0.97);
    expect(wornDrop).toBeLessThan(0.7);
  });

  it('gas: anode current higher than without the fault, rising from sweep to sweep', () => {
    const plan = smallTriodePlan({ vg1Volts: [-1, -1.5, -2], warmupSeconds: 20 });
    const clean = iaBySetting(sweepWith('none', plan));
    const b = manualBench({ valve: '12AX7#5', fault: 'gas' });
    b.send(sweepLine(1, plan));
    b.run(PLAN_MS);
    b.send(sweepLine(2, plan));
    b.run(PLAN_MS);
    const first = iaBySetting(b, 1);
    const second = iaBySetting(b, 2);
    // Compare where all three sweeps have a reading (a gassy curve can reach its limit sooner).
    const strong = [...clean].filter(([k, ia]) => ia > 0.5 && first.has(k) && second.has(k));
    expect(strong.length).toBeGreaterThan(5);
    for (const [k, ia] of strong) {
      expect(first.get(k)! / ia).toBeGreaterThan(1.02);
      expect(first.get(k)! / ia).toBeLessThan(1.3);
      expect(second.get(k)!).toBeGreaterThan(first.get(k)!);
    }
    const grid = b.tracer.snapshot().lastReading!.gridCurrentMicroamps;
    expect(grid).toBeLessThan(0);
  });

  it('intermittent: some readings drop out to near zero, the rest match the sound valve', () => {
    const plan = smallTriodePlan({ vaStepVolts: 10 });
    const sound = iaBySetting(sweepWith('none', plan));
    const flaky = iaBySetting(sweepWith('intermittent', plan));
    const strong = [...sound].filter(([, ia]) => ia > 0.3);
    const dropped = strong.filter(([k, ia]) => flaky.get(k)! < 0.1 * ia);
    expect(dropped.length).toBeGreaterThan(0);
    expect(dropped.length).toBeLessThan(strong.length * 0.3);
  });

  it('corrupt: about 5 % of outgoing lines fail the checksum at the host', () => {
    const b = manualBench({ fault: 'corrupt' });
    b.send(sweepLine(1, smallTriodePlan({ vaStepVolts: 2 })));
    b.run(PLAN_MS);
    const sent = b.tracer.snapshot().counters;
    const host = b.host.decoder.reader.stats;
    expect(sent.linesCorrupted).toBeGreaterThan(0);
    // Every intact line decodes and no corrupted one does (one flipped '$' can split a line
    // into two dropped frames, so drops are at least the corrupted lines).
    expect(b.host.messages.length).toBe(sent.linesSent - sent.linesCorrupted);
    expect(host.badChecksum + host.truncated + host.badBytes).toBeGreaterThanOrEqual(
      sent.linesCorrupted,
    );
    expect(sent.linesCorrupted / sent.linesSent).toBeGreaterThan(0.02);
    expect(sent.linesCorrupted / sent.linesSent).toBeLessThan(0.1);
  });

  it('unplug: the tracer falls silent and deaf; its watchdog switches the outputs off', () => {
    const b = manualBench();
    b.send(sweepLine(1, smallTriodePlan({ settleMs: 100 })));
    b.run(31_000);
    const heard = b.host.messages.length;
    const changes: boolean[] = [];
    b.tracer.onLinkChange((plugged) => changes.push(plugged));
    b.tracer.setFault('unplug');
    b.run(10_000);
    expect(b.host.messages.length).toBe(heard);
    expect(b.tracer.snapshot()).toMatchObject({
      unplugged: true,
      highVoltage: false,
      heaterVolts: 0,
    });
    expect(b.tracer.snapshot().counters.watchdogExpiries).toBe(1);
    b.tracer.setFault('none');
    b.send(line({ type: 'identify' }));
    expect(b.host.messages.slice(heard).map((m) => m.type)).toEqual(['ident', 'caps']);
    expect(changes).toEqual([false, true]);
  });

  it('none clears a fault', () => {
    const b = manualBench({ fault: 'short' });
    b.tracer.setFault('none');
    b.send(sweepLine(1, smallTriodePlan()));
    b.run(PLAN_MS);
    expect(b.host.of('end')[0].reason).toBe('complete');
  });
});
