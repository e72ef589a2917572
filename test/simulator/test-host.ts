import {
  DeviceStreamDecoder,
  encodeCommand,
  frame,
  type DeviceMessage,
  type HostCommand,
} from '../../shared/protocol';
import type { SweepPlan } from '../../shared/domain/sweep';

type Of<T extends DeviceMessage['type']> = Extract<DeviceMessage, { type: T }>;

/** The host side of a tracer link in tests: decodes what the device sends and waits on it. */
export class TestHost {
  readonly decoder = new DeviceStreamDecoder();
  readonly messages: DeviceMessage[] = [];
  readonly lines: string[] = [];
  private waiters: Array<() => void> = [];

  /** Feeds bytes received from the device. */
  feed = (chunk: string | Uint8Array): void => {
    if (typeof chunk === 'string') this.lines.push(chunk);
    this.messages.push(...this.decoder.push(chunk));
    for (const w of this.waiters.splice(0)) w();
  };

  /** Messages of one type, in arrival order. */
  of<T extends DeviceMessage['type']>(type: T): Of<T>[] {
    return this.messages.filter((m): m is Of<T> => m.type === type);
  }

  /** Resolves with the first message (from index `from`) that matches, or rejects on timeout. */
  waitFor<T extends DeviceMessage['type']>(
    type: T,
    match: (m: Of<T>) => boolean = () => true,
    timeoutMs = 10000,
    from = 0,
  ): Promise<Of<T>> {
    return new Promise((resolve, reject) => {
      const timer = setTimeout(() => reject(new Error(`timed out waiting for ${type}`)), timeoutMs);
      const look = () => {
        const found = this.messages
          .slice(from)
          .find((m): m is Of<T> => m.type === type && match(m as Of<T>));
        if (found) {
          clearTimeout(timer);
          resolve(found);
        } else {
          this.waiters.push(look);
        }
      };
      look();
    });
  }
}

/** One framed host command line. */
export function line(command: HostCommand): string {
  return frame(encodeCommand(command));
}

/** The framed SWP line for a plan. */
export function sweepLine(sweepId: number, plan: SweepPlan): string {
  return line({ type: 'sweep', sweepId, plan });
}

/** A small anode-family plan for a 12AX7 that stays inside its limits everywhere (no clipping). */
export function smallTriodePlan(overrides: Partial<SweepPlan> = {}): SweepPlan {
  return {
    kind: 'anode',
    vaStartVolts: 0,
    vaStopVolts: 300,
    vaStepVolts: 25,
    vg1Volts: [-2, -3, -4],
    vg2Volts: 0,
    heaterVolts: 12.6,
    iaMaxMilliamps: 10,
    paMaxWatts: 1,
    iaTripMilliamps: 15,
    warmupSeconds: 30,
    settleMs: 2,
    ...overrides,
  };
}
