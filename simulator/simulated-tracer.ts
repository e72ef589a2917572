import { TRIP_MARGIN } from '../shared/domain/plan-check';
import type { DeviceCapabilities, SweepEndReason, SweepPlan } from '../shared/domain/sweep';
import {
  CommandStreamDecoder,
  droppedCount,
  encodeDeviceMessage,
  frame,
  type DeviceErrorCode,
  type DeviceMessage,
  type DeviceState,
  type HostCommand,
} from '../shared/protocol';
import { admitCheck, type CheckCommand } from './check-admission';
import { CheckRun, type CheckStep } from './check-run';
import type { FaultName } from './fault-name';
import { LineCorrupter } from './line-corrupter';
import { admitPlan } from './plan-admission';
import { ScaledClock } from './scaled-clock';
import type { SimClock, SimTimer } from './sim-clock';
import {
  CURVE_RESET_MS,
  DEFAULT_WATCHDOG_MS,
  ELECTRODE_CHECK_VOLTS,
  SHORT_MAX_VOLTS,
  SIMULATED_EXTENSIONS,
  HEARTBEAT_MAX_WALL_MS,
  HEARTBEAT_MIN_WALL_MS,
  HEARTBEAT_MS,
  SIMULATED_DEVICE,
} from './simulated-device';
import { SimulatedValve } from './simulated-valve';
import { SweepRun } from './sweep-run';
import { TracerBusyError } from './tracer-busy-error';
import type { LastReading, TracerSnapshot } from './tracer-snapshot';
import type { ValveSpec } from './valve-spec';
import { GRID_FEED_OHMS, ValveSocket } from './valve-socket';

/** Tags of the check commands, for their ACK and NAK lines. */
const CHECK_TAGS: Record<CheckCommand['type'], string> = {
  leakage: 'LKG',
  emission: 'EMI',
  'grid-current': 'GAS',
};

/** Why a single reading trips (as in a sweep: Ia above iatrip, or Va·Ia above 1.5 × pamax). */
function tripText(
  iaTripMilliamps: number,
  paMaxWatts: number,
  vaVolts: number,
  iaMilliamps: number,
): string | undefined {
  const watts = (vaVolts * iaMilliamps) / 1000;
  if (iaMilliamps <= iaTripMilliamps && watts <= paMaxWatts * TRIP_MARGIN) return undefined;
  return `trip: Ia ${iaMilliamps.toFixed(3)} mA (${watts.toFixed(2)} W) at ${vaVolts} V`;
}

/** Options of a SimulatedTracer. */
export interface SimulatedTracerOptions {
  /** Valve in the socket at start, "TYPE#SEED" or a spec. */
  valve: string | ValveSpec;
  /** Device clock; default a ScaledClock at `speed`. */
  clock?: SimClock;
  /** Speed factor of the default clock; default 1. */
  speed?: number;
  /** Fault in effect at start; default 'none'. */
  fault?: FaultName;
  /** Watchdog period, wall-clock ms; default 3000. */
  watchdogMs?: number;
  /** Whether readings carry noise; default true. */
  noise?: boolean;
}

/**
 * The simulated tracer, independent of any transport: feed it host bytes with receive(), and
 * it sends framed lines (`$BODY*HH\r\n`) to the onLine listeners. It follows PROTOCOL.md.
 */
export class SimulatedTracer {
  /** Capabilities announced in CAP. */
  readonly capabilities: DeviceCapabilities;
  private readonly clock: SimClock;
  private readonly socket: ValveSocket;
  private readonly decoder = new CommandStreamDecoder();
  private readonly lineListeners = new Set<(line: string) => void>();
  private readonly linkListeners = new Set<(plugged: boolean) => void>();
  private readonly corrupter = new LineCorrupter(`${SIMULATED_DEVICE.serial}/corrupt`);
  private readonly startMs: number;
  private heaterVolts = 0;
  private highVoltage = false;
  private faultLatched = false;
  private unplugged = false;
  private stopped = false;
  private run: SweepRun | CheckRun | null = null;
  private heartbeatTimer: SimTimer | null = null;
  private watchdogTimer: SimTimer | null = null;
  private lastReading: LastReading | null = null;
  private readonly counters: Omit<TracerSnapshot['counters'], 'linesCorrupted' | 'hostLines'> = {
    commands: {
      identify: 0,
      status: 0,
      keepalive: 0,
      heater: 0,
      sweep: 0,
      abort: 0,
      off: 0,
      zero: 0,
      extensions: 0,
      leakage: 0,
      emission: 0,
      'grid-current': 0,
    },
    linesSent: 0,
    linesSuppressed: 0,
    sweepsStarted: 0,
    checksStarted: 0,
    sweepsEnded: { complete: 0, aborted: 0, limit: 0, fault: 0, 'link-lost': 0 },
    pointsSent: 0,
    errors: 0,
    watchdogExpiries: 0,
  };

  constructor(options: SimulatedTracerOptions) {
    this.clock = options.clock ?? new ScaledClock(options.speed ?? 1);
    const watchdogMs = options.watchdogMs ?? DEFAULT_WATCHDOG_MS;
    if (!Number.isInteger(watchdogMs) || watchdogMs < 100) {
      throw new Error(`watchdog must be an integer of at least 100 ms, got ${watchdogMs}`);
    }
    this.capabilities = { ...SIMULATED_DEVICE, watchdogMs };
    this.socket = new ValveSocket(SimulatedValve.fromSpec(options.valve), {
      noise: options.noise,
      deviceSerial: SIMULATED_DEVICE.serial,
    });
    this.startMs = this.clock.now();
    this.setFault(options.fault ?? 'none');
    this.scheduleHeartbeat();
  }

  /** Adds a listener for outgoing lines; returns a function that removes it. */
  onLine(listener: (line: string) => void): () => void {
    this.lineListeners.add(listener);
    return () => this.lineListeners.delete(listener);
  }

  /** Adds a listener told when the unplug fault pulls (false) or restores (true) the link. */
  onLinkChange(listener: (plugged: boolean) => void): () => void {
    this.linkListeners.add(listener);
    return () => this.linkListeners.delete(listener);
  }

  /** Whether the unplug fault has cut the link. */
  get isUnplugged(): boolean {
    return this.unplugged;
  }

  /** Feeds bytes from the host, in any split; dropped lines are counted and never acted on. */
  receive(chunk: string | Uint8Array): void {
    if (this.stopped || this.unplugged) return;
    const acceptedBefore = this.decoder.reader.stats.accepted;
    const commands = this.decoder.push(chunk);
    if (this.decoder.reader.stats.accepted > acceptedBefore) this.kickWatchdog();
    for (const command of commands) this.handle(command);
  }

  /** Puts another valve in the socket; refused while a sweep runs. */
  setValve(spec: string | ValveSpec): void {
    if (this.run) {
      throw new TracerBusyError(
        `sweep ${this.run.id} is running; abort it before changing the valve`,
      );
    }
    this.socket.insert(SimulatedValve.fromSpec(spec), this.clock.now());
  }

  /** Puts a fault into effect ('none' clears); see README.md for what each one does. */
  setFault(fault: FaultName): void {
    this.socket.setFault(fault, this.clock.now());
    const unplugged = fault === 'unplug';
    if (unplugged !== this.unplugged) {
      this.unplugged = unplugged;
      for (const listener of this.linkListeners) listener(!unplugged);
    }
    if (fault === 'open-heater' && this.heaterVolts > 0) {
      const text = 'heater open circuit: no heater current';
      if (this.run) this.endSweep('fault', 'E30', text);
      else this.raiseError('E30', text);
    }
  }

  /** Switches every output off and stops all timers; the tracer answers nothing afterwards. */
  shutdown(): void {
    if (this.stopped) return;
    if (this.run) this.endSweep('aborted');
    this.allOutputsOff();
    this.heartbeatTimer?.cancel();
    this.watchdogTimer?.cancel();
    this.stopped = true;
  }

  /** State, valve, fault and counters, for the control API. */
  snapshot(): TracerSnapshot {
    const now = this.clock.now();
    const stats = this.decoder.reader.stats;
    const s = this.run;
    const valve = this.socket.valve;
    return {
      valve: valve.label,
      valveType: valve.type.designation,
      seed: valve.seed,
      fault: this.socket.fault,
      state: this.state(),
      unplugged: this.unplugged,
      uptimeMs: Math.round(now - this.startMs),
      speed: this.clock.speed,
      watchdogMs: this.capabilities.watchdogMs,
      heaterVolts: this.heaterVolts,
      highVoltage: this.highVoltage,
      warmupLeftSeconds: this.warmupLeftSeconds(now),
      emission: this.socket.emissionAt(now),
      sweep: s && {
        id: s.id,
        kind: s instanceof SweepRun ? s.plan.kind : s.kind,
        phase: s.phase,
        points: s.count,
        plannedPoints: s.plannedPoints,
      },
      lastReading: this.lastReading && { ...this.lastReading },
      counters: {
        ...this.counters,
        linesCorrupted: this.corrupter.corrupted,
        hostLines: { ...stats, dropped: droppedCount(stats) },
        commands: { ...this.counters.commands },
        sweepsEnded: { ...this.counters.sweepsEnded },
      },
    };
  }

  private handle(command: HostCommand): void {
    this.counters.commands[command.type]++;
    switch (command.type) {
      case 'identify': {
        const { protocolVersion, model, serial, firmware, ...caps } = this.capabilities;
        this.send({ type: 'ident', protocolVersion, model, serial, firmware });
        this.send({ type: 'caps', caps });
        return;
      }
      case 'status':
        this.sendHeartbeat();
        return;
      case 'keepalive':
        return;
      case 'heater':
        this.setHeaterCommand(command.volts);
        return;
      case 'sweep':
        this.startSweep(command.sweepId, command.plan);
        return;
      case 'abort':
        if (!this.run || this.run.id !== command.sweepId) {
          this.nak('ABT', 'E11', `no sweep ${command.sweepId} is running`);
          return;
        }
        this.send({ type: 'ack', command: 'ABT', sweepId: command.sweepId });
        this.endSweep('aborted');
        return;
      case 'off': {
        const running = this.run;
        this.allOutputsOff();
        this.faultLatched = false;
        this.send({ type: 'ack', command: 'OFF' });
        if (running) this.endSweep('aborted');
        return;
      }
      case 'extensions':
        this.send({ type: 'extensions', extensions: SIMULATED_EXTENSIONS });
        return;
      case 'leakage':
      case 'emission':
      case 'grid-current':
        this.startCheck(command);
        return;
      case 'zero': {
        if (this.run) {
          this.nak('ZRO', 'E12', `busy: sweep ${this.run.id} is running`);
          return;
        }
        const offsets = this.socket.zero();
        this.send({
          type: 'zeroed',
          iaOffsetMilliamps: offsets.iaMilliamps,
          ig2OffsetMilliamps: offsets.ig2Milliamps,
        });
        return;
      }
    }
  }

  private setHeaterCommand(volts: number): void {
    if (this.run) {
      this.nak('HTR', 'E12', `busy: sweep ${this.run.id} is running`);
      return;
    }
    if (volts > this.capabilities.heaterMaxVolts) {
      this.nak('HTR', 'E21', `heater ${volts} V is above ${this.capabilities.heaterMaxVolts} V`);
      return;
    }
    if (volts > 0 && !this.socket.heaterCurrentFlows()) {
      this.allOutputsOff();
      this.faultLatched = true;
      this.nak('HTR', 'E30', 'heater open circuit: no heater current');
      return;
    }
    this.setHeater(volts);
    this.send({ type: 'ack', command: 'HTR' });
  }

  private startSweep(id: number, plan: SweepPlan): void {
    if (this.run) {
      this.nak('SWP', 'E12', `busy: sweep ${this.run.id} is running`);
      return;
    }
    const refusal = admitPlan(plan, this.capabilities);
    if (refusal) {
      this.nak('SWP', refusal.code, refusal.text);
      return;
    }
    this.send({ type: 'ack', command: 'SWP', sweepId: id });
    this.counters.sweepsStarted++;
    this.faultLatched = false;
    const run = new SweepRun(id, plan, this.clock, this.socket, {
      send: (m) => {
        if (m.type === 'point') this.counters.pointsSent++;
        this.send(m);
      },
      highVoltageOn: () => (this.highVoltage = true),
      reading: (r) => (this.lastReading = r),
      finished: (reason, code, text) => this.endSweep(reason, code, text),
    });
    this.run = run;
    this.setHeater(plan.heaterVolts);
    if (plan.heaterVolts > 0 && !this.socket.heaterCurrentFlows()) {
      this.endSweep('fault', 'E30', 'heater open circuit: no heater current');
      return;
    }
    run.start();
  }

  private startCheck(command: CheckCommand): void {
    const tag = CHECK_TAGS[command.type];
    if (this.run) {
      this.nak(tag, 'E12', `busy: run ${this.run.id} is going on`);
      return;
    }
    const refusal = admitCheck(command, this.capabilities, SIMULATED_EXTENSIONS);
    if (refusal) {
      this.nak(tag, refusal.code, refusal.text);
      return;
    }
    this.send({ type: 'ack', command: tag, sweepId: command.checkId });
    this.counters.checksStarted++;
    this.faultLatched = false;
    const { warmupSeconds, settleMs, heaterVolts } = command.plan;
    const run = new CheckRun(
      command.checkId,
      { kind: command.type, warmupSeconds, settleMs, ...this.checkSteps(command) },
      this.clock,
      {
        send: (m) => this.send(m),
        highVoltageOn: () => (this.highVoltage = true),
        finished: (reason, code, text) => this.endSweep(reason, code, text),
      },
    );
    this.run = run;
    this.setHeater(heaterVolts);
    if (heaterVolts > 0 && !this.socket.heaterCurrentFlows()) {
      this.endSweep('fault', 'E30', 'heater open circuit: no heater current');
      return;
    }
    run.start();
  }

  /** The electrode check and readings of a check command. */
  private checkSteps(command: CheckCommand): {
    preCheck?: (atMs: number) => { code: DeviceErrorCode; text: string } | null;
    steps: CheckStep[];
  } {
    const id = command.checkId;
    const socket = this.socket;
    const record = (reading: Omit<LastReading, 'sweepId'>) =>
      (this.lastReading = { sweepId: id, ...reading });
    switch (command.type) {
      case 'leakage':
        return {
          steps: command.plan.pairs.map(({ pair, volts }) => () => {
            const r = socket.readLeakage(pair, volts);
            return {
              message: { type: 'leakage', checkId: id, pair, volts, ...r },
            };
          }),
        };
      case 'emission': {
        const p = command.plan;
        return {
          steps: [
            (atMs) => {
              const r = socket.readStrapped(p.vaVolts, atMs);
              record({
                vaVolts: p.vaVolts,
                vg1Volts: p.vaVolts,
                vg2Volts: socket.valve.hasScreen ? p.vaVolts : 0,
                iaMilliamps: r.milliamps,
                ig2Milliamps: 0,
                gridCurrentMicroamps: 0,
                emission: socket.emissionAt(atMs),
              });
              if (r.overRange && p.vaVolts <= SHORT_MAX_VOLTS) {
                const text = `short circuit: over range at ${p.vaVolts} V with grids strapped`;
                return { fault: { code: 'E31', text } };
              }
              return {
                message: { type: 'emission', checkId: id, vaVolts: p.vaVolts, ...r },
                trip: tripText(p.iaTripMilliamps, p.paMaxWatts, p.vaVolts, r.milliamps),
              };
            },
          ],
        };
      }
      case 'grid-current': {
        const p = command.plan;
        return {
          preCheck: (atMs) => {
            const check = socket.read(ELECTRODE_CHECK_VOLTS, p.vg1Volts, 0, atMs);
            if (!check.overRange) return null;
            const text = `short circuit: over range at the ${ELECTRODE_CHECK_VOLTS} V electrode check`;
            return { code: 'E31', text };
          },
          steps: [
            (atMs) => {
              // The supplies come up after the check, as between the curves of a sweep.
              const r = socket.read(p.vaVolts, p.vg1Volts, p.vg2Volts, atMs + CURVE_RESET_MS);
              record({ vaVolts: p.vaVolts, vg1Volts: p.vg1Volts, vg2Volts: p.vg2Volts, ...r });
              return {
                message: {
                  type: 'grid-current',
                  checkId: id,
                  vaVolts: p.vaVolts,
                  vg1Volts: p.vg1Volts,
                  vg2Volts: p.vg2Volts,
                  iaMilliamps: r.iaMilliamps,
                  ig1Microamps: r.gridCurrentMicroamps,
                  gridKiloohms: GRID_FEED_OHMS / 1000,
                },
                trip: tripText(p.iaTripMilliamps, p.paMaxWatts, p.vaVolts, r.iaMilliamps),
              };
            },
          ],
        };
      }
    }
  }

  /** Ends the running sweep; with an error code every output goes off and ERR follows END. */
  private endSweep(reason: SweepEndReason, code?: DeviceErrorCode, text?: string): void {
    const sweep = this.run;
    if (!sweep) return;
    sweep.cancel();
    this.run = null;
    this.highVoltage = false;
    this.send({ type: 'end', sweepId: sweep.id, reason, count: sweep.count });
    this.counters.sweepsEnded[reason]++;
    if (code) this.raiseError(code, text ?? code);
  }

  private raiseError(code: DeviceErrorCode, text: string): void {
    this.allOutputsOff();
    this.faultLatched = true;
    this.counters.errors++;
    this.send({ type: 'error', code, text });
  }

  private allOutputsOff(): void {
    this.highVoltage = false;
    this.setHeater(0);
  }

  private setHeater(volts: number): void {
    this.heaterVolts = volts;
    this.socket.setHeater(volts, this.clock.now());
  }

  /* The watchdog runs on wall-clock time (the simulated clock scaled back by the speed),
   * because the host keeps its KAL cadence on the wall clock. */
  private kickWatchdog(): void {
    this.watchdogTimer?.cancel();
    this.watchdogTimer = this.clock.setTimer(this.capabilities.watchdogMs * this.clock.speed, () =>
      this.watchdogExpired(),
    );
  }

  private watchdogExpired(): void {
    this.watchdogTimer = null;
    if (!this.run && !this.highVoltage && this.heaterVolts === 0) return;
    this.counters.watchdogExpiries++;
    const text = `watchdog: no host line for ${this.capabilities.watchdogMs} ms; outputs off`;
    if (this.run) this.endSweep('link-lost', 'E40', text);
    else this.raiseError('E40', text);
  }

  private scheduleHeartbeat(): void {
    const speed = this.clock.speed;
    const periodMs = Math.min(
      Math.max(HEARTBEAT_MS, HEARTBEAT_MIN_WALL_MS * speed),
      HEARTBEAT_MAX_WALL_MS * speed,
    );
    this.heartbeatTimer = this.clock.setTimer(periodMs, () => {
      this.sendHeartbeat();
      this.scheduleHeartbeat();
    });
  }

  private sendHeartbeat(): void {
    const now = this.clock.now();
    this.send({
      type: 'heartbeat',
      uptimeMs: Math.round(now - this.startMs),
      state: this.state(),
      heaterVolts: this.heaterVolts,
      highVoltage: this.highVoltage,
      warmupLeftSeconds: this.warmupLeftSeconds(now),
    });
  }

  private state(): DeviceState {
    if (this.run) return this.run.phase === 'warming' ? 'warming' : 'sweeping';
    return this.faultLatched ? 'fault' : 'idle';
  }

  private warmupLeftSeconds(now: number): number {
    return this.run?.warmupLeftSeconds(now) ?? 0;
  }

  private nak(command: string, code: DeviceErrorCode, text: string): void {
    this.send({ type: 'nak', command, code, text });
  }

  private send(message: DeviceMessage): void {
    if (this.unplugged) {
      this.counters.linesSuppressed++;
      return;
    }
    let line = frame(encodeDeviceMessage(message));
    if (this.socket.fault === 'corrupt') line = this.corrupter.pass(line);
    this.counters.linesSent++;
    for (const listener of this.lineListeners) listener(line);
  }
}
