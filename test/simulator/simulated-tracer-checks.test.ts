import { describe, expect, it } from 'vitest';
import { ELECTRODE_PAIRS, type ElectrodePair, type HostCommand } from '../../shared/protocol';
import type { FaultName } from '../../simulator/fault-name';
import { manualBench, type ManualBench } from './bench';
import { line, smallTriodePlan, sweepLine } from './test-host';

type Leakage = Extract<HostCommand, { type: 'leakage' }>;
type Emission = Extract<HostCommand, { type: 'emission' }>;
type GridCurrent = Extract<HostCommand, { type: 'grid-current' }>;

const TRIODE_PAIRS: ElectrodePair[] = [
  'heater-cathode',
  'grid1-cathode',
  'grid1-anode',
  'anode-cathode',
];

function leakage(checkId: number, changes: Partial<Leakage['plan']> = {}): Leakage {
  return {
    type: 'leakage',
    checkId,
    plan: {
      heaterVolts: 12.6,
      warmupSeconds: 20,
      settleMs: 200,
      pairs: TRIODE_PAIRS.map((pair) => ({ pair, volts: 100 })),
      ...changes,
    },
  };
}

function emission(checkId: number, changes: Partial<Emission['plan']> = {}): Emission {
  return {
    type: 'emission',
    checkId,
    plan: {
      vaVolts: 10,
      heaterVolts: 12.6,
      iaTripMilliamps: 60,
      paMaxWatts: 0.75,
      warmupSeconds: 30,
      settleMs: 50,
      ...changes,
    },
  };
}

function gridCurrent(checkId: number, changes: Partial<GridCurrent['plan']> = {}): GridCurrent {
  return {
    type: 'grid-current',
    checkId,
    plan: {
      vaVolts: 250,
      vg1Volts: -2,
      vg2Volts: 0,
      heaterVolts: 12.6,
      iaTripMilliamps: 5,
      paMaxWatts: 1,
      warmupSeconds: 20,
      settleMs: 200,
      ...changes,
    },
  };
}

/** Runs one command on a fresh bench (valve, fault) for long enough, and returns the bench. */
function runCheck(command: HostCommand, fault: FaultName = 'none', valve = '12AX7#5'): ManualBench {
  const b = manualBench({ valve, fault });
  b.send(line(command));
  b.run(90_000);
  return b;
}

/*
 * Koren triode model written out here, independently of shared/physics/koren.ts, from
 * N. Koren, Glass Audio 8(5), 1996 (2x form), 12AX7 set MU 100, EX 1.4, KG1 1060, KP 600,
 * KVB 300: with the grid strapped to the anode, Vg = Va.
 */
function strapped12ax7Milliamps(va: number): number {
  const [mu, ex, kg1, kp, kvb] = [100, 1.4, 1060, 600, 300];
  const e1 = (va / kp) * Math.log(1 + Math.exp(kp * (1 / mu + va / Math.sqrt(kvb + va * va))));
  return ((2 * Math.pow(e1, ex)) / kg1) * 1000;
}

describe('SimulatedTracer checks (protocol extensions)', () => {
  it('announces its extensions in answer to EXT', () => {
    const b = manualBench();
    b.send(line({ type: 'extensions' }));
    expect(b.host.of('extensions')).toEqual([
      {
        type: 'extensions',
        extensions: {
          features: ['leakage', 'emission', 'grid-current', 'section-select'],
          gridFeedKiloohms: 47,
          leakageMaxVolts: 200,
        },
      },
    ]);
  });

  it('measures nA-level leakage on every pair of a sound valve, one LK line each, then END DONE', () => {
    const b = runCheck(leakage(41));
    expect(b.host.of('ack')[0]).toEqual({ type: 'ack', command: 'LKG', sweepId: 41 });
    const readings = b.host.of('leakage');
    expect(readings.map((r) => r.pair)).toEqual(TRIODE_PAIRS);
    for (const r of readings) {
      expect(r).toMatchObject({ checkId: 41, volts: 100, overRange: false });
      // 100 V over 0.5-5 GOhm of insulation: 20 to 200 nA, with a little meter noise.
      expect(r.microamps).toBeGreaterThan(0.01);
      expect(r.microamps).toBeLessThan(0.25);
    }
    expect(b.host.of('end')).toEqual([{ type: 'end', sweepId: 41, reason: 'complete', count: 4 }]);
  });

  it('shows the short fault between anode and cathode only, as an over-range reading', () => {
    const readings = runCheck(leakage(42), 'short').host.of('leakage');
    const byPair = new Map(readings.map((r) => [r.pair, r]));
    expect(byPair.get('anode-cathode')).toMatchObject({ microamps: 500, overRange: true });
    for (const pair of ['heater-cathode', 'grid1-cathode', 'grid1-anode'] as const) {
      expect(byPair.get(pair)!.overRange).toBe(false);
      expect(byPair.get(pair)!.microamps).toBeLessThan(0.25);
    }
  });

  it('shows the leaky-heater fault between heater and cathode only, in tens of uA', () => {
    const readings = runCheck(leakage(43), 'leaky-heater').host.of('leakage');
    const hk = readings.find((r) => r.pair === 'heater-cathode')!;
    // 100 V across 2 MOhm of leakage plus the 100 kOhm current limit: 47.6 uA.
    expect(hk.microamps).toBeGreaterThan(45);
    expect(hk.microamps).toBeLessThan(50);
    expect(hk.overRange).toBe(false);
    expect(readings.filter((r) => r !== hk).every((r) => r.microamps < 0.25)).toBe(true);
  });

  it('reads a triode socket with no screen as open between the screen pins', () => {
    const pairs = ELECTRODE_PAIRS.map((pair) => ({ pair, volts: 150 }));
    const readings = runCheck(leakage(44, { pairs })).host.of('leakage');
    const screen = readings.filter((r) => r.pair.startsWith('screen'));
    expect(screen).toHaveLength(3);
    expect(screen.every((r) => r.microamps < 0.01)).toBe(true);
  });

  it('counts the warm-up down in the heartbeat before the first pair', () => {
    const b = manualBench();
    b.send(line(leakage(45, { warmupSeconds: 20 })));
    b.run(5000);
    b.send(line({ type: 'status' }));
    expect(b.host.of('heartbeat').at(-1)).toMatchObject({
      state: 'warming',
      heaterVolts: 12.6,
      highVoltage: false,
      warmupLeftSeconds: 15,
    });
    expect(b.host.of('leakage')).toEqual([]);
    b.run(16_000);
    b.send(line({ type: 'status' }));
    expect(b.host.of('heartbeat').at(-1)).toMatchObject({ warmupLeftSeconds: 0 });
    expect(b.host.of('leakage').length).toBeGreaterThan(0);
  });

  it('reads the nominal 12AX7 diode-connected within 2 % of the strapped Koren model', () => {
    const b = runCheck(emission(51), 'none', '12AX7#0');
    const [reading] = b.host.of('emission');
    const model = strapped12ax7Milliamps(10);
    expect(model).toBeGreaterThan(15);
    expect(reading).toMatchObject({ checkId: 51, vaVolts: 10, overRange: false });
    expect(Math.abs(reading.milliamps - model) / model).toBeLessThan(0.02);
    expect(b.host.of('end')[0]).toMatchObject({ sweepId: 51, reason: 'complete', count: 1 });
  });

  it('reads about half the emission of the same valve under the low-emission fault', () => {
    const sound = runCheck(emission(52)).host.of('emission')[0].milliamps;
    const low = runCheck(emission(52), 'low-emission').host.of('emission')[0].milliamps;
    expect(low / sound).toBeGreaterThan(0.47);
    expect(low / sound).toBeLessThan(0.53);
  });

  it('stops an emission check on a shorted valve with END FAULT and ERR E31', () => {
    const b = runCheck(emission(53), 'short');
    expect(b.host.of('emission')).toEqual([]);
    expect(b.host.of('end')).toEqual([{ type: 'end', sweepId: 53, reason: 'fault', count: 0 }]);
    expect(b.host.of('error').map((e) => e.code)).toEqual(['E31']);
  });

  it('reads nA of grid current on a sound valve and a reverse uA-level current on a gassy one', () => {
    const sound = runCheck(gridCurrent(61)).host.of('grid-current')[0];
    expect(sound).toMatchObject({ checkId: 61, vaVolts: 250, vg1Volts: -2, gridKiloohms: 47 });
    expect(Math.abs(sound.ig1Microamps)).toBeLessThan(0.02);
    expect(sound.iaMilliamps).toBeGreaterThan(0.5);
    const gassy = runCheck(gridCurrent(62), 'gas').host.of('grid-current')[0];
    // 0.5 uA at the type's reference current, grown by heater time (see README.md).
    expect(gassy.ig1Microamps).toBeLessThan(-0.3);
    expect(gassy.iaMilliamps).toBeGreaterThan(sound.iaMilliamps);
  });

  it('stops a grid-current check on a shorted valve at the electrode check', () => {
    const b = runCheck(gridCurrent(63), 'short');
    expect(b.host.of('grid-current')).toEqual([]);
    expect(b.host.of('error').map((e) => e.code)).toEqual(['E31']);
  });

  it('sends the reading that trips, then END LIMIT and ERR E20, with every output off', () => {
    const b = runCheck(gridCurrent(64, { iaTripMilliamps: 0.2 }));
    expect(b.host.of('grid-current')).toHaveLength(1);
    expect(b.host.of('end')).toEqual([{ type: 'end', sweepId: 64, reason: 'limit', count: 1 }]);
    expect(b.host.of('error').map((e) => e.code)).toEqual(['E20']);
    expect(b.tracer.snapshot()).toMatchObject({ highVoltage: false, heaterVolts: 0 });
  });

  it('ends a check on an open heater with END FAULT and ERR E30', () => {
    const b = runCheck(leakage(65), 'open-heater');
    expect(b.host.of('end')).toEqual([{ type: 'end', sweepId: 65, reason: 'fault', count: 0 }]);
    expect(b.host.of('error').map((e) => e.code)).toEqual(['E30']);
  });

  it('refuses figures beyond its limits with E21 and malformed ones with E11', () => {
    const b = manualBench();
    b.send(line(leakage(1, { pairs: [{ pair: 'heater-cathode', volts: 250 }] })));
    b.send(line(emission(2, { vaVolts: 100 })));
    b.send(line(gridCurrent(3, { vg1Volts: -150 })));
    b.send(line(gridCurrent(4, { settleMs: 20_000 })));
    expect(b.host.of('nak').map((n) => [n.command, n.code])).toEqual([
      ['LKG', 'E21'],
      ['EMI', 'E21'],
      ['GAS', 'E21'],
      ['GAS', 'E11'],
    ]);
    expect(b.host.of('ack')).toEqual([]);
  });

  it('runs one thing at a time: a check while a sweep runs, or a sweep during a check, is busy', () => {
    const b = manualBench();
    b.send(sweepLine(1, smallTriodePlan()));
    b.send(line(leakage(2)));
    expect(b.host.of('nak').at(-1)).toMatchObject({ command: 'LKG', code: 'E12' });
    b.send(line({ type: 'abort', sweepId: 1 }));
    b.send(line(leakage(3)));
    b.send(sweepLine(4, smallTriodePlan()));
    expect(b.host.of('nak').at(-1)).toMatchObject({ command: 'SWP', code: 'E12' });
  });

  it('aborts a check on ABT with END ABORT, and its watchdog ends one with WDT', () => {
    const b = manualBench();
    b.send(line(leakage(7)));
    b.run(2000);
    b.send(line({ type: 'abort', sweepId: 7 }));
    expect(b.host.of('end').at(-1)).toEqual({
      type: 'end',
      sweepId: 7,
      reason: 'aborted',
      count: 0,
    });
    b.send(line(leakage(8)));
    b.silence(10_000);
    expect(b.host.of('end').at(-1)).toMatchObject({ sweepId: 8, reason: 'link-lost' });
    expect(b.host.of('error').at(-1)!.code).toBe('E40');
  });
});
