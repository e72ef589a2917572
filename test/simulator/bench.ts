import { ManualClock } from '../../simulator/manual-clock';
import { SimulatedTracer, type SimulatedTracerOptions } from '../../simulator/simulated-tracer';
import { line, TestHost } from './test-host';

/** A tracer on a manual clock wired to a test host, for instant, deterministic core tests. */
export interface ManualBench {
  clock: ManualClock;
  tracer: SimulatedTracer;
  host: TestHost;
  /** Sends raw bytes to the tracer. */
  send(bytes: string): void;
  /** Advances simulated time by `ms`, with a KAL every 500 ms as a live host sends. */
  run(ms: number): void;
  /** Advances simulated time by `ms` with the host silent. */
  silence(ms: number): void;
}

/** Builds a ManualBench; the valve defaults to the nominal 12AX7 (seed 0). */
export function manualBench(options: Partial<SimulatedTracerOptions> = {}): ManualBench {
  const clock = new ManualClock();
  const tracer = new SimulatedTracer({ valve: '12AX7#0', clock, ...options });
  const host = new TestHost();
  tracer.onLine(host.feed);
  const keepalive = line({ type: 'keepalive' });
  return {
    clock,
    tracer,
    host,
    send: (bytes) => tracer.receive(bytes),
    run(ms) {
      for (let left = ms; left > 0; left -= 500) {
        tracer.receive(keepalive);
        clock.advance(Math.min(500, left));
      }
    },
    silence: (ms) => clock.advance(ms),
  };
}
