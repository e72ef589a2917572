import { createServer, type Server, type Socket } from 'node:net';
import { SerialPort } from 'serialport';
import type { DeviceCapabilities, SweepPlan } from '../../shared/domain/sweep';
import type { DeviceExtensions } from '../../shared/protocol/check-plan';
import { frame } from '../../shared/protocol/checksum';
import { CommandStreamDecoder } from '../../shared/protocol/decoder';
import {
  encodeDeviceMessage,
  PROTOCOL_VERSION,
  type DeviceErrorCode,
  type DeviceMessage,
  type DeviceState,
  type HostCommand,
} from '../../shared/protocol/messages';
import { until } from './until';

/** Limits the fake tracer announces unless a test says otherwise. */
export const FAKE_CAPS: Omit<
  DeviceCapabilities,
  'protocolVersion' | 'model' | 'serial' | 'firmware'
> = {
  vaMaxVolts: 500,
  vg2MaxVolts: 450,
  vg1MinVolts: -100,
  vg1MaxVolts: 0,
  iaMaxMilliamps: 250,
  heaterMaxVolts: 13.2,
  heaterMaxAmps: 2,
  pulse: true,
  watchdogMs: 3000,
};

export interface FakeTracerOptions {
  /** Protocol version it claims (default: ours). */
  protocolVersion?: number;
  /** Identify requests it leaves unanswered before it answers (default 0). */
  ignoreIdentifies?: number;
  /** Answer SWP with this NAK instead of an ACK. */
  refuseSweep?: { code: DeviceErrorCode; text: string };
  /** Say nothing at all to SWP. */
  silentOnSweep?: boolean;
  /** Automatic heartbeat period, ms (default 500). */
  heartbeatMs?: number;
  /** Optional functions it answers EXT with; without, it ignores EXT (a core-only tracer). */
  extensions?: DeviceExtensions;
  /** Answer LKG, EMI and GAS with this NAK instead of an ACK. */
  refuseCheck?: { code: DeviceErrorCode; text: string };
}

type CheckStart = Extract<HostCommand, { type: 'leakage' | 'emission' | 'grid-current' }>;

/** A command as the fake tracer received it, with its arrival time. */
export interface Received {
  command: HostCommand;
  atMs: number;
}

/**
 * A minimal tracer for bridge tests: it answers the protocol's commands through the shared
 * codec, and the test itself decides which readings it sends and when.
 */
export class FakeTracer {
  readonly received: Received[] = [];
  readonly decoder = new CommandStreamDecoder();
  state: DeviceState = 'idle';
  heaterVolts = 0;
  highVoltage = false;
  sweep: { id: number; plan: SweepPlan; sent: number } | null = null;
  /** The check (LKG, EMI, GAS) running, with the result lines sent so far. */
  check: { id: number; command: CheckStart; sent: number } | null = null;
  private identifiesIgnored = 0;
  private heartbeat: NodeJS.Timeout | null = null;
  private startedAt = Date.now();

  private constructor(
    private readonly write: (text: string) => void,
    private readonly closeLink: () => Promise<void>,
    readonly options: FakeTracerOptions,
  ) {
    this.heartbeat = setInterval(() => this.beat(), options.heartbeatMs ?? 500);
  }

  /** Opens the device end of a pty pair with the real serialport binding. */
  static async serial(path: string, options: FakeTracerOptions = {}): Promise<FakeTracer> {
    const port = new SerialPort({ path, baudRate: 115200, autoOpen: false });
    await new Promise<void>((ok, fail) => port.open((err) => (err ? fail(err) : ok())));
    port.on('error', () => undefined);
    const tracer = new FakeTracer(
      (text) => {
        if (port.isOpen) port.write(text);
      },
      () =>
        new Promise<void>((done) => {
          if (port.isOpen) port.close(() => done());
          else done();
        }),
      options,
    );
    port.on('data', (chunk: Buffer) => tracer.onBytes(chunk));
    return tracer;
  }

  /** Listens on 127.0.0.1 port 0 and serves one connection at a time. */
  static async tcp(options: FakeTracerOptions = {}): Promise<{ tracer: FakeTracer; port: number }> {
    let socket: Socket | null = null;
    const server: Server = createServer((s) => {
      socket?.destroy();
      socket = s;
      s.on('data', (chunk) => tracer.onBytes(chunk));
      s.on('error', () => undefined);
    });
    await new Promise<void>((ok) => server.listen(0, '127.0.0.1', ok));
    const tracer = new FakeTracer(
      (text) => {
        if (socket && !socket.destroyed) socket.write(text);
      },
      () =>
        new Promise<void>((done) => {
          socket?.destroy();
          server.close(() => done());
        }),
      options,
    );
    const address = server.address();
    return { tracer, port: typeof address === 'object' && address ? address.port : 0 };
  }

  /** Commands received so far of one type. */
  commands<T extends HostCommand['type']>(type: T): Extract<HostCommand, { type: T }>[] {
    return this.received
      .map((r) => r.command)
      .filter((c): c is Extract<HostCommand, { type: T }> => c.type === type);
  }

  /** Position of the first and last command of a type in arrival order (-1 when none). */
  positions(type: HostCommand['type']): { first: number; last: number } {
    const at = this.received.flatMap((r, i) => (r.command.type === type ? [i] : []));
    return { first: at.length ? at[0] : -1, last: at.length ? at[at.length - 1] : -1 };
  }

  /** Waits until at least n commands of a type have arrived. */
  async waitFor(type: HostCommand['type'], n = 1, ms = 5000): Promise<void> {
    await until(`${n} ${type} command(s) at the tracer`, () => this.commands(type).length >= n, ms);
  }

  /** Sends a device message, framed. */
  send(m: DeviceMessage): void {
    this.write(frame(encodeDeviceMessage(m)));
  }

  /** Sends bytes as they are (for corrupted lines). */
  sendRaw(text: string): void {
    this.write(text);
  }

  /** Sends a reading of the running sweep with the next seq (or the seq given). */
  point(vaVolts: number, iaMilliamps: number, seq?: number, curve = 0): void {
    const s = this.sweep;
    if (!s) throw new Error('no sweep is running on the fake tracer');
    const m: DeviceMessage = {
      type: 'point',
      sweepId: s.id,
      seq: seq ?? s.sent,
      curve,
      vaVolts,
      vg1Volts: s.plan.vg1Volts[curve] ?? 0,
      vg2Volts: s.plan.vg2Volts,
      iaMilliamps,
      ig2Milliamps: 0,
    };
    s.sent = Math.max(s.sent, m.seq + 1);
    this.state = 'sweeping';
    this.highVoltage = true;
    this.send(m);
  }

  /** Ends the running sweep as the tracer would. */
  finish(reason: 'complete' | 'limit' | 'fault' = 'complete', count?: number): void {
    const s = this.sweep;
    if (!s) throw new Error('no sweep is running on the fake tracer');
    this.send({ type: 'end', sweepId: s.id, reason, count: count ?? s.sent });
    this.stopSweep();
  }

  /** Sends a result line (LK, EM, GC) of the running check with its id, and counts it. */
  checkResult(
    m:
      | Omit<Extract<DeviceMessage, { type: 'leakage' }>, 'checkId'>
      | Omit<Extract<DeviceMessage, { type: 'emission' }>, 'checkId'>
      | Omit<Extract<DeviceMessage, { type: 'grid-current' }>, 'checkId'>,
  ): void {
    const c = this.check;
    if (!c) throw new Error('no check is running on the fake tracer');
    c.sent++;
    this.state = 'sweeping';
    this.highVoltage = true;
    this.send({ ...m, checkId: c.id } as DeviceMessage);
  }

  /** Ends the running check as the tracer would. */
  finishCheck(reason: 'complete' | 'limit' | 'fault' = 'complete', count?: number): void {
    const c = this.check;
    if (!c) throw new Error('no check is running on the fake tracer');
    this.send({ type: 'end', sweepId: c.id, reason, count: count ?? c.sent });
    this.stopSweep();
  }

  /** Sends one heartbeat now. */
  beat(): void {
    this.send({
      type: 'heartbeat',
      uptimeMs: Date.now() - this.startedAt,
      state: this.state,
      heaterVolts: this.heaterVolts,
      highVoltage: this.highVoltage,
      warmupLeftSeconds: 0,
    });
  }

  /** Stops heartbeats and closes the link. */
  async close(): Promise<void> {
    if (this.heartbeat) clearInterval(this.heartbeat);
    this.heartbeat = null;
    await this.closeLink();
  }

  private onBytes(chunk: Buffer): void {
    for (const command of this.decoder.push(chunk)) {
      this.received.push({ command, atMs: Date.now() });
      this.answer(command);
    }
  }

  private answer(c: HostCommand): void {
    switch (c.type) {
      case 'identify':
        if (this.identifiesIgnored < (this.options.ignoreIdentifies ?? 0)) {
          this.identifiesIgnored++;
          return;
        }
        this.send({
          type: 'ident',
          protocolVersion: this.options.protocolVersion ?? PROTOCOL_VERSION,
          model: 'TEST-TRACER',
          serial: 'T-0001',
          firmware: '0.9',
        });
        this.send({ type: 'caps', caps: FAKE_CAPS });
        return;
      case 'status':
        this.beat();
        return;
      case 'keepalive':
        return;
      case 'heater':
        this.heaterVolts = c.volts;
        this.send({ type: 'ack', command: 'HTR' });
        return;
      case 'sweep':
        if (this.options.silentOnSweep) return;
        if (this.options.refuseSweep) {
          this.send({ type: 'nak', command: 'SWP', ...this.options.refuseSweep });
          return;
        }
        this.sweep = { id: c.sweepId, plan: c.plan, sent: 0 };
        this.heaterVolts = c.plan.heaterVolts;
        this.state = 'warming';
        this.send({ type: 'ack', command: 'SWP', sweepId: c.sweepId });
        return;
      case 'abort':
        this.send({ type: 'ack', command: 'ABT', sweepId: c.sweepId });
        if (this.sweep?.id === c.sweepId) {
          this.send({ type: 'end', sweepId: c.sweepId, reason: 'aborted', count: this.sweep.sent });
          this.stopSweep();
        }
        if (this.check?.id === c.sweepId) {
          this.send({ type: 'end', sweepId: c.sweepId, reason: 'aborted', count: this.check.sent });
          this.stopSweep();
        }
        return;
      case 'off':
        this.send({ type: 'ack', command: 'OFF' });
        if (this.sweep) {
          this.send({
            type: 'end',
            sweepId: this.sweep.id,
            reason: 'aborted',
            count: this.sweep.sent,
          });
        }
        if (this.check) {
          this.send({
            type: 'end',
            sweepId: this.check.id,
            reason: 'aborted',
            count: this.check.sent,
          });
        }
        this.stopSweep();
        this.heaterVolts = 0;
        return;
      case 'zero':
        this.send({ type: 'zeroed', iaOffsetMilliamps: 0, ig2OffsetMilliamps: 0 });
        return;
      case 'extensions':
        if (this.options.extensions) {
          this.send({ type: 'extensions', extensions: this.options.extensions });
        }
        return;
      case 'leakage':
      case 'emission':
      case 'grid-current': {
        const tag = { leakage: 'LKG', emission: 'EMI', 'grid-current': 'GAS' }[c.type];
        if (this.options.refuseCheck) {
          this.send({ type: 'nak', command: tag, ...this.options.refuseCheck });
          return;
        }
        this.check = { id: c.checkId, command: c, sent: 0 };
        this.heaterVolts = c.plan.heaterVolts;
        this.state = 'warming';
        this.send({ type: 'ack', command: tag, sweepId: c.checkId });
        return;
      }
    }
  }

  private stopSweep(): void {
    this.sweep = null;
    this.check = null;
    this.state = 'idle';
    this.highVoltage = false;
  }
}
