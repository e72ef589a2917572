import { describe, expect, it } from 'vitest';
import { defaultPlan, findValveType } from '../../shared/catalog/valve-types';
import { anodeSteps, plannedPointCount, type SweepPlan } from '../../shared/domain/sweep';
import { checksum, frame } from '../../shared/protocol';
import { CONVERSION_MS } from '../../simulator/simulated-device';
import { manualBench } from './bench';
import { line, smallTriodePlan, sweepLine } from './test-host';

/*
 * Koren triode model written out here, independently of shared/physics/koren.ts, from
 * N. Koren, "Improved vacuum tube models for SPICE simulations", Glass Audio 8(5), 1996 (2x
 * form as published), with his 12AX7 set: MU 100, EX 1.4, KG1 1060, KP 600, KVB 300.
 */
function koren12ax7Milliamps(va: number, vg: number): number {
  const [mu, ex, kg1, kp, kvb] = [100, 1.4, 1060, 600, 300];
  const e1 = (va / kp) * Math.log(1 + Math.exp(kp * (1 / mu + vg / Math.sqrt(kvb + va * va))));
  return e1 > 0 ? ((2 * Math.pow(e1, ex)) / kg1) * 1000 : 0;
}

function sweepDurationMs(plan: SweepPlan): number {
  return plan.warmupSeconds * 1000 + plannedPointCount(plan) * (plan.settleMs + CONVERSION_MS + 25);
}

describe('SimulatedTracer', () => {
  it('answers IDN with its identity and then its limits', () => {
    const b = manualBench({ watchdogMs: 2500 });
    b.send(line({ type: 'identify' }));
    expect(b.host.messages.map((m) => m.type)).toEqual(['ident', 'caps']);
    expect(b.host.of('ident')[0]).toMatchObject({ protocolVersion: 1, model: 'EMB-SIM' });
    expect(b.host.of('caps')[0].caps).toEqual({
      vaMaxVolts: 500,
      vg2MaxVolts: 450,
      vg1MinVolts: -100,
      vg1MaxVolts: 0,
      iaMaxMilliamps: 250,
      heaterMaxVolts: 13.2,
      heaterMaxAmps: 2,
      pulse: true,
      watchdogMs: 2500,
    });
  });

  it('runs a complete anode sweep with every planned point, contiguous seq and END DONE', () => {
    const b = manualBench({ valve: '12AX7#1' });
    const plan = smallTriodePlan();
    b.send(sweepLine(7, plan));
    b.run(sweepDurationMs(plan));
    expect(b.host.of('ack')[0]).toEqual({ type: 'ack', command: 'SWP', sweepId: 7 });
    const points = b.host.of('point');
    const expected = plan.vg1Volts.flatMap((vg1, curve) =>
      anodeSteps(plan).map((va) => ({ curve, vaVolts: va, vg1Volts: vg1 })),
    );
    expect(
      points.map((p) => ({ curve: p.curve, vaVolts: p.vaVolts, vg1Volts: p.vg1Volts })),
    ).toEqual(expected);
    expect(points.map((p) => p.seq)).toEqual(expected.map((_, i) => i));
    expect(points.every((p) => p.sweepId === 7 && p.ig2Milliamps === 0)).toBe(true);
    expect(b.host.of('end')).toEqual([
      { type: 'end', sweepId: 7, reason: 'complete', count: expected.length },
    ]);
  });

  it('reads the nominal 12AX7 (seed 0) within 2 % of the Koren model at 250 V and -2 V', () => {
    const b = manualBench({ valve: '12AX7#0' });
    const plan = smallTriodePlan({ vaStartVolts: 250, vaStopVolts: 250, vg1Volts: [-2] });
    b.send(sweepLine(1, plan));
    b.run(sweepDurationMs(plan));
    const [point] = b.host.of('point');
    const model = koren12ax7Milliamps(250, -2);
    // The model gives about 0.95 mA here (the team's reference sheet, section 2).
    expect(model).toBeCloseTo(0.952, 2);
    expect(Math.abs(point.iaMilliamps - model) / model).toBeLessThan(0.02);
  });

  it('measures the section the plan names: the two sections of a double triode differ a little', () => {
    const read = (valve: string, section: 1 | 2) => {
      const b = manualBench({ valve });
      const plan = smallTriodePlan({
        vaStartVolts: 250,
        vaStopVolts: 250,
        vg1Volts: [-2],
        section,
      });
      b.send(sweepLine(1, plan));
      b.run(sweepDurationMs(plan));
      return b.host.of('point')[0].iaMilliamps;
    };
    // Seed 0 is the nominal valve, both sections alike; an individual's sections are a few % apart.
    expect(read('12AX7#0', 2)).toBeCloseTo(read('12AX7#0', 1), 2);
    const one = read('12AX7#5', 1);
    const two = read('12AX7#5', 2);
    expect(Math.abs(two - one) / one).toBeGreaterThan(0.002);
    expect(Math.abs(two - one) / one).toBeLessThan(0.15);
    // A single triode has no section 2: an empty position in the socket draws nothing.
    expect(read('300B#1', 2)).toBeLessThan(0.01);
  });

  it('ends each curve at the first reading at or above the current limit and keeps it', () => {
    const b = manualBench({ valve: '12AX7#3' });
    const plan = smallTriodePlan({ vg1Volts: [0, -1, -2], iaMaxMilliamps: 1.5, paMaxWatts: 1 });
    b.send(sweepLine(2, plan));
    b.run(sweepDurationMs(plan));
    const points = b.host.of('point');
    const steps = anodeSteps(plan).length;
    for (let curve = 0; curve < plan.vg1Volts.length; curve++) {
      const curvePoints = points.filter((p) => p.curve === curve);
      const ia = curvePoints.map((p) => p.iaMilliamps);
      expect(ia.slice(0, -1).every((x) => x < 1.5)).toBe(true);
      expect(ia[ia.length - 1] >= 1.5 || curvePoints.length === steps).toBe(true);
    }
    expect(points.filter((p) => p.curve === 0).length).toBeLessThan(steps);
    expect(b.host.of('end')[0]).toMatchObject({ reason: 'complete', count: points.length });
  });

  it('ends each curve at the first reading at or above the dissipation limit', () => {
    const b = manualBench({ valve: '12AX7#3' });
    const plan = smallTriodePlan({ vg1Volts: [0, -1], iaMaxMilliamps: 10, paMaxWatts: 0.3 });
    b.send(sweepLine(3, plan));
    b.run(sweepDurationMs(plan));
    const points = b.host.of('point');
    for (const curve of [0, 1]) {
      const watts = points
        .filter((p) => p.curve === curve)
        .map((p) => (p.vaVolts * p.iaMilliamps) / 1000);
      expect(watts.slice(0, -1).every((w) => w < 0.3)).toBe(true);
      expect(watts[watts.length - 1]).toBeGreaterThanOrEqual(0.3);
    }
  });

  it('runs a transfer sweep: Va fixed, one point per grid voltage on curve 0', () => {
    const b = manualBench({ valve: '12AX7#2' });
    const plan = smallTriodePlan({
      kind: 'transfer',
      vaStartVolts: 200,
      vg1Volts: [-4, -3, -2, -1.5],
    });
    b.send(sweepLine(4, plan));
    b.run(sweepDurationMs(plan));
    const points = b.host.of('point');
    expect(points.map((p) => [p.curve, p.vaVolts, p.vg1Volts])).toEqual(
      plan.vg1Volts.map((vg1) => [0, 200, vg1]),
    );
    const ia = points.map((p) => p.iaMilliamps);
    expect(ia).toEqual([...ia].sort((x, y) => x - y));
    expect(b.host.of('end')[0]).toMatchObject({ reason: 'complete', count: 4 });
  });

  it('trips on a reading above the trip current: END LIMIT, ERR E20 and every output off', () => {
    const b = manualBench({ valve: '12AX7#0' });
    // One 200 V step from 0 V at zero bias jumps from nothing to about 5 mA, past both limits.
    const plan = smallTriodePlan({
      vg1Volts: [0],
      vaStepVolts: 200,
      vaStopVolts: 400,
      iaMaxMilliamps: 1,
      iaTripMilliamps: 1.2,
    });
    b.send(sweepLine(5, plan));
    b.run(sweepDurationMs(plan));
    const points = b.host.of('point');
    expect(points.length).toBe(2);
    expect(points[1].iaMilliamps).toBeGreaterThan(1.2);
    expect(b.host.of('end')).toEqual([{ type: 'end', sweepId: 5, reason: 'limit', count: 2 }]);
    expect(b.host.of('error').map((e) => e.code)).toEqual(['E20']);
    b.send(line({ type: 'status' }));
    expect(b.host.of('heartbeat').at(-1)).toMatchObject({
      state: 'fault',
      highVoltage: false,
      heaterVolts: 0,
    });
  });

  it('trips on dissipation above 1.5 times the plan limit', () => {
    const b = manualBench({ valve: '12AX7#0' });
    const plan = smallTriodePlan({
      vg1Volts: [0],
      vaStepVolts: 200,
      vaStopVolts: 400,
      paMaxWatts: 0.5,
    });
    b.send(sweepLine(6, plan));
    b.run(sweepDurationMs(plan));
    const last = b.host.of('point').at(-1)!;
    expect((last.vaVolts * last.iaMilliamps) / 1000).toBeGreaterThan(0.75);
    expect(b.host.of('end')[0].reason).toBe('limit');
    expect(b.host.of('error')[0].code).toBe('E20');
  });

  it('refuses plans outside its own limits with NAK E21 and starts nothing', () => {
    const b = manualBench();
    b.send(sweepLine(8, smallTriodePlan({ vaStopVolts: 600 })));
    b.send(sweepLine(9, smallTriodePlan({ vg1Volts: [-120] })));
    b.send(sweepLine(10, smallTriodePlan({ heaterVolts: 14 })));
    b.send(sweepLine(11, smallTriodePlan({ iaMaxMilliamps: 200, iaTripMilliamps: 300 })));
    b.run(5000);
    expect(b.host.of('nak').map((n) => [n.command, n.code])).toEqual([
      ['SWP', 'E21'],
      ['SWP', 'E21'],
      ['SWP', 'E21'],
      ['SWP', 'E21'],
    ]);
    expect(b.host.of('nak')[0].text).toMatch(/600 V/);
    expect(b.host.of('ack')).toEqual([]);
    expect(b.host.of('point')).toEqual([]);
  });

  it('refuses a malformed plan with NAK E11', () => {
    const b = manualBench();
    b.send(sweepLine(12, smallTriodePlan({ vaStartVolts: 300, vaStopVolts: 100 })));
    expect(b.host.of('nak').map((n) => n.code)).toEqual(['E11']);
  });

  it('refuses a second sweep with NAK E12 while one runs, and runs the first to the end', () => {
    const b = manualBench();
    const plan = smallTriodePlan();
    b.send(sweepLine(13, plan));
    b.run(1000);
    b.send(sweepLine(14, plan));
    b.run(sweepDurationMs(plan));
    expect(b.host.of('nak').map((n) => [n.command, n.code])).toEqual([['SWP', 'E12']]);
    expect(b.host.of('end').map((e) => [e.sweepId, e.reason])).toEqual([[13, 'complete']]);
  });

  it('reports WARM with the seconds left during warm-up, with the anode supply off', () => {
    const b = manualBench();
    b.send(sweepLine(15, smallTriodePlan({ warmupSeconds: 20 })));
    b.run(5000);
    b.send(line({ type: 'status' }));
    const hb = b.host.of('heartbeat').at(-1)!;
    expect(hb).toMatchObject({
      state: 'warming',
      heaterVolts: 12.6,
      highVoltage: false,
      warmupLeftSeconds: 15,
    });
    expect(b.host.of('point')).toEqual([]);
    b.run(20000);
    expect(b.host.of('heartbeat').some((h) => h.state === 'sweeping' && h.highVoltage)).toBe(true);
  });

  it('sends a heartbeat every 1000 ms of simulated time', () => {
    const b = manualBench();
    b.run(10_000);
    const beats = b.host.of('heartbeat');
    expect(beats.map((h) => h.uptimeMs)).toEqual(
      [1, 2, 3, 4, 5, 6, 7, 8, 9, 10].map((s) => s * 1000),
    );
    expect(beats.every((h) => h.state === 'idle')).toBe(true);
  });

  it('reads low on a cold cathode: emission rises over the first seconds of heater time', () => {
    const cold = manualBench({ valve: '12AX7#4' });
    const warm = manualBench({ valve: '12AX7#4' });
    const plan = (warmupSeconds: number) =>
      smallTriodePlan({
        kind: 'transfer',
        vaStartVolts: 250,
        vg1Volts: [-1, -1, -1, -1],
        settleMs: 1000,
        warmupSeconds,
      });
    cold.send(sweepLine(1, plan(0)));
    warm.send(sweepLine(1, plan(30)));
    cold.run(40_000);
    warm.run(40_000);
    const coldIa = cold.host.of('point').map((p) => p.iaMilliamps);
    const warmIa = warm.host.of('point').map((p) => p.iaMilliamps);
    expect(coldIa[0]).toBeLessThan(0.05 * warmIa[0]);
    expect(coldIa[3]).toBeGreaterThan(coldIa[0]);
    expect(coldIa[3]).toBeLessThan(warmIa[3]);
  });

  it('aborts on ABT with ACK and END ABORT, keeping the heater on', () => {
    const b = manualBench();
    const plan = smallTriodePlan({ warmupSeconds: 0, settleMs: 100 });
    b.send(sweepLine(16, plan));
    b.run(1000);
    b.send(line({ type: 'abort', sweepId: 99 }));
    b.send(line({ type: 'abort', sweepId: 16 }));
    const sent = b.host.of('point').length;
    expect(sent).toBeGreaterThan(0);
    expect(b.host.of('nak')[0]).toMatchObject({ command: 'ABT', code: 'E11' });
    expect(b.host.of('ack').at(-1)).toEqual({ type: 'ack', command: 'ABT', sweepId: 16 });
    expect(b.host.of('end')).toEqual([
      { type: 'end', sweepId: 16, reason: 'aborted', count: sent },
    ]);
    b.run(5000);
    expect(b.host.of('point').length).toBe(sent);
    b.send(line({ type: 'status' }));
    expect(b.host.of('heartbeat').at(-1)).toMatchObject({
      state: 'idle',
      heaterVolts: 12.6,
      highVoltage: false,
    });
  });

  it('switches every output off on OFF and aborts the running sweep', () => {
    const b = manualBench();
    b.send(sweepLine(17, smallTriodePlan({ warmupSeconds: 0, settleMs: 100 })));
    b.run(1000);
    b.send(line({ type: 'off' }));
    b.send(line({ type: 'status' }));
    expect(b.host.of('ack').at(-1)).toEqual({ type: 'ack', command: 'OFF' });
    expect(b.host.of('end')[0]).toMatchObject({ sweepId: 17, reason: 'aborted' });
    expect(b.host.of('heartbeat').at(-1)).toMatchObject({
      heaterVolts: 0,
      highVoltage: false,
      state: 'idle',
    });
  });

  it('zeroes the current channels when idle and refuses while a sweep runs', () => {
    const b = manualBench();
    b.send(line({ type: 'zero' }));
    const [zeroed] = b.host.of('zeroed');
    expect(zeroed.iaOffsetMilliamps).toBeGreaterThanOrEqual(0);
    expect(zeroed.iaOffsetMilliamps).toBeLessThan(0.01);
    b.send(sweepLine(18, smallTriodePlan()));
    b.send(line({ type: 'zero' }));
    expect(b.host.of('nak').at(-1)).toMatchObject({ command: 'ZRO', code: 'E12' });
  });

  it('sets the heater on HTR and refuses a voltage above its limit', () => {
    const b = manualBench();
    b.send(line({ type: 'heater', volts: 6.3 }));
    b.send(line({ type: 'heater', volts: 20 }));
    b.send(line({ type: 'status' }));
    expect(b.host.of('ack')).toEqual([{ type: 'ack', command: 'HTR' }]);
    expect(b.host.of('nak')[0]).toMatchObject({ command: 'HTR', code: 'E21' });
    expect(b.host.of('heartbeat').at(-1)).toMatchObject({ heaterVolts: 6.3, highVoltage: false });
  });

  it('measures screen current for a pentode', () => {
    const b = manualBench({ valve: 'EL34#4' });
    const plan = { ...defaultPlan(findValveType('EL34')!), warmupSeconds: 30 };
    b.send(sweepLine(19, plan));
    b.run(sweepDurationMs(plan));
    const points = b.host.of('point');
    expect(points.length).toBeGreaterThan(100);
    expect(points.every((p) => p.vg2Volts === 250)).toBe(true);
    expect(
      points.filter((p) => p.vg1Volts === -10 && p.vaVolts >= 100).every((p) => p.ig2Milliamps > 1),
    ).toBe(true);
    expect(b.host.of('end')[0].reason).toBe('complete');
  });

  describe('watchdog', () => {
    it('switches outputs off after silence: END WDT and ERR E40', () => {
      const b = manualBench({ watchdogMs: 3000 });
      b.send(sweepLine(20, smallTriodePlan({ warmupSeconds: 0, settleMs: 200 })));
      b.silence(2900);
      expect(b.host.of('end')).toEqual([]);
      b.silence(200);
      const sent = b.host.of('point').length;
      expect(b.host.of('end')).toEqual([
        { type: 'end', sweepId: 20, reason: 'link-lost', count: sent },
      ]);
      expect(b.host.of('error').map((e) => e.code)).toEqual(['E40']);
      b.send(line({ type: 'status' }));
      expect(b.host.of('heartbeat').at(-1)).toMatchObject({
        heaterVolts: 0,
        highVoltage: false,
        state: 'fault',
      });
    });

    it('keeps a sweep running while the host sends KAL', () => {
      const b = manualBench({ watchdogMs: 3000 });
      const plan = smallTriodePlan({ settleMs: 200 });
      b.send(sweepLine(21, plan));
      b.run(sweepDurationMs(plan) + 60_000);
      expect(b.host.of('end')[0].reason).toBe('complete');
      expect(b.host.of('error')).toEqual([]);
    });

    it('switches a heater left on by HTR off after silence', () => {
      const b = manualBench({ watchdogMs: 1000 });
      b.send(line({ type: 'heater', volts: 12.6 }));
      b.silence(1500);
      expect(b.host.of('error').map((e) => e.code)).toEqual(['E40']);
      expect(b.host.of('end')).toEqual([]);
    });

    it('is not reset by lines with a bad checksum', () => {
      const b = manualBench({ watchdogMs: 3000 });
      b.send(sweepLine(22, smallTriodePlan({ settleMs: 200 })));
      for (let i = 0; i < 8; i++) {
        b.send('$KAL*00\r\n');
        b.silence(500);
      }
      expect(b.host.of('end')[0]).toMatchObject({ sweepId: 22, reason: 'link-lost' });
    });
  });

  describe('host line checking', () => {
    it('drops and counts corrupted lines and never acts on them', () => {
      const b = manualBench();
      const good = sweepLine(30, smallTriodePlan());
      const body = good.slice(1, good.indexOf('*'));
      const flipped = body.replace('SWP,30,A,0,300', 'SWP,30,A,0,900');
      b.send(`$${flipped}*${checksum(body)}\r\n`); // bit errors in the body, old checksum
      b.send(`$${body}\r\n`); // no checksum at all
      b.send(`$${body}*${checksum(body)}`.slice(0, 40) + good); // cut short by the next '$'
      b.send(frame('SWP,31,A,0,300')); // checksum right, fields missing
      b.send(frame('FRY,1')); // checksum right, no such command
      b.send(frame('KAL') + '$IDN*4A\r\n'.replace('4A', 'FF'));
      b.run(100);
      const stats = b.tracer.snapshot().counters.hostLines;
      expect(stats.badChecksum).toBe(3);
      expect(stats.truncated).toBe(1);
      expect(stats.malformed).toBe(2);
      expect(stats.dropped).toBe(6);
      // Only the intact SWP,30 that followed the cut-short line was acted on.
      expect(b.host.of('ack')).toEqual([{ type: 'ack', command: 'SWP', sweepId: 30 }]);
      expect(b.host.messages.filter((m) => m.type === 'ident' || m.type === 'nak')).toEqual([]);
    });

    it('accepts a command split over many chunks', () => {
      const b = manualBench();
      for (const ch of line({ type: 'identify' })) b.send(ch);
      expect(b.host.of('caps').length).toBe(1);
    });
  });
});
