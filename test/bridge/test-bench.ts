import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { startBridge, type Bridge, type BridgeOptions } from '../../bridge/bridge';
import type { SweepPlan } from '../../shared/domain/sweep';
import { FakeHub } from './fake-hub';
import { FakeTracer, type FakeTracerOptions } from './fake-tracer';
import { openSocatPair, type SocatPair } from './socat-pair';
import { until } from './until';

/** Bench token the fake hub expects. */
export const TEST_TOKEN = 'test-bench-token-4b1e';

/** A plan well inside the fake tracer's limits: 2 curves of 0 to 300 V in 10 V steps. */
export const SAFE_PLAN: SweepPlan = {
  kind: 'anode',
  vaStartVolts: 0,
  vaStopVolts: 300,
  vaStepVolts: 10,
  vg1Volts: [0, -1],
  vg2Volts: 0,
  heaterVolts: 12.6,
  iaMaxMilliamps: 5,
  paMaxWatts: 1,
  iaTripMilliamps: 7.5,
  warmupSeconds: 0,
  settleMs: 0,
};

/** Everything one bridge test needs: a pty pair, a fake tracer, a fake hub and the bridge. */
export interface TestBench {
  dir: string;
  pair: SocatPair | null;
  tracer: FakeTracer;
  hub: FakeHub;
  bridge: Bridge;
  logs: string[];
  /** Options the bridge was started with (to start another one on the same journal). */
  options: BridgeOptions;
  /** Waits until the bridge is identified with the tracer and connected to the hub. */
  ready(): Promise<void>;
  /** Stops the bridge (if still running) and everything else, and removes the directory. */
  close(): Promise<void>;
}

export interface TestBenchOptions {
  tracer?: FakeTracerOptions;
  bridge?: Partial<BridgeOptions>;
  /** Reach the tracer over TCP instead of a pty pair. */
  tcp?: boolean;
}

/** Sets up a bench; reconnect delays are short so tests stay quick. */
export async function openTestBench(o: TestBenchOptions = {}): Promise<TestBench> {
  const dir = mkdtempSync(join(tmpdir(), 'emberline-bridge-'));
  const logs: string[] = [];
  const hub = await FakeHub.start(TEST_TOKEN);
  let pair: SocatPair | null = null;
  let tracer: FakeTracer;
  const link: Partial<BridgeOptions> = {};
  if (o.tcp) {
    const served = await FakeTracer.tcp(o.tracer);
    tracer = served.tracer;
    link.tcp = { host: '127.0.0.1', port: served.port };
  } else {
    pair = await openSocatPair(dir);
    tracer = await FakeTracer.serial(pair.device, o.tracer);
    link.serialPath = pair.host;
  }
  const options: BridgeOptions = {
    ...link,
    hubUrl: hub.url,
    token: TEST_TOKEN,
    journalFile: join(dir, 'journal.jsonl'),
    log: (line) => {
      logs.push(line);
      if (process.env['BRIDGE_LOG']) console.log(line);
    },
    reconnectInitialMs: 20,
    reconnectMaxMs: 200,
    ...o.bridge,
  };
  const bridge = startBridge(options);
  const bench: TestBench = {
    dir,
    pair,
    tracer,
    hub,
    bridge,
    logs,
    options,
    async ready() {
      await until(
        'bridge ready on tracer and hub',
        () => bench.bridge.deviceReady && bench.bridge.hubConnected && hub.clientConnected,
      );
    },
    async close() {
      await bench.bridge.stop();
      await bench.tracer.close();
      await pair?.unplug();
      await hub.close();
      rmSync(dir, { recursive: true, force: true });
    },
  };
  return bench;
}
