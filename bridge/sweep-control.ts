import {
  checkPlan,
  limitsFromDevice,
  readingTrips,
  TRIP_MARGIN,
} from '../shared/domain/plan-check';
import {
  sectionOf,
  type SweepEndReason,
  type SweepPlan,
  type SweepPoint,
} from '../shared/domain/sweep';
import type { BenchDeviceStatus, BridgeToHub, HubToBridge } from '../shared/hub/messages';
import { num, type DeviceMessage } from '../shared/protocol/messages';
import type { DeviceLink } from './device-link';
import type { Journal } from './journal';
import type { PointSender } from './point-sender';
import {
  armTimer,
  disarm,
  endWentMissing,
  holdEnd,
  newRun,
  pointRange,
  points,
  type TracerRun,
} from './tracer-run';

type Heartbeat = Extract<DeviceMessage, { type: 'heartbeat' }>;
type Point = Extract<DeviceMessage, { type: 'point' }>;
type End = Extract<DeviceMessage, { type: 'end' }>;

/** The sweep the bridge looks after (TracerRun has its phase, timer and held END). */
interface ActiveSweep extends TracerRun {
  sweepId: number;
  plan: SweepPlan;
  /** Next seq expected from the tracer; also the number of points journaled. */
  nextSeq: number;
  /** Whether the bridge changed the heater for this sweep. */
  heaterChanged: boolean;
  /** Last ERR the tracer reported during the sweep, for the end message. */
  lastError: string | null;
}

/** What SweepControl works with. */
export interface SweepControlDeps {
  device: DeviceLink;
  journal: Journal;
  sender: PointSender;
  log: (line: string) => void;
  sendToHub: (m: BridgeToHub) => boolean;
  /** Wait for the tracer to answer HTR, SWP or ABT, ms. */
  commandTimeoutMs: number;
  /** Check (quick-test step) the bench is running, or null: a sweep then waits its turn. */
  activeCheckId?: () => number | null;
}

/** Heater voltages closer than this count as already set, V. */
const HEATER_TOLERANCE_VOLTS = 0.05;

/**
 * Runs sweeps for the hub on the tracer and keeps the bench safe meanwhile. Policies:
 * - A plan is checked against the tracer's limits before anything is sent (the tracer checks
 *   again), and refused with every problem listed.
 * - Every reading is checked again here (readingTrips); a trip switches outputs off at once and
 *   ends the sweep with reason 'limit'.
 * - Points must arrive with seq 0, 1, 2, ... A gap means the serial link dropped a corrupted
 *   line: the bridge switches outputs off and ends the sweep with reason 'fault', naming the
 *   lost points; the points before the gap are kept and reported. A curve with a hole would
 *   skew gm, ra and matching, and the lost line is a reading the bridge's own trip check never
 *   saw, so the run is stopped rather than carried on; the technician repeats it.
 * - Losing the hub switches outputs off and ends the sweep 'link-lost' (journaled, reported when
 *   the hub returns); losing the tracer ends it 'link-lost' as well.
 */
export class SweepControl {
  private active: ActiveSweep | null = null;
  private lastBeat: Heartbeat | null = null;
  private readonly strayLogged = new Set<number>();

  constructor(private readonly deps: SweepControlDeps) {}

  /** Sweep being started or run, or null. */
  get activeSweepId(): number | null {
    return this.active?.sweepId ?? null;
  }

  /** Device status for the hub. After a link loss the last known high-voltage flag is kept. */
  status(): BenchDeviceStatus {
    const online = this.deps.device.ready;
    const beat = this.lastBeat;
    const a = this.active;
    return {
      deviceOnline: online,
      state: online && beat ? beat.state : null,
      highVoltage: beat?.highVoltage ?? false,
      heaterVolts: beat?.heaterVolts ?? 0,
      warmupLeftSeconds: beat?.warmupLeftSeconds ?? 0,
      sweepId: a && (a.phase === 'running' || a.phase === 'aborting') ? a.sweepId : null,
      lineStats: this.deps.device.lineStats,
      checkId: this.deps.activeCheckId?.() ?? null,
    };
  }

  /** Sends the status to the hub now. */
  reportStatus(): void {
    this.sendStatus();
  }

  /** A message from the ready tracer. */
  onDeviceMessage(m: DeviceMessage): void {
    switch (m.type) {
      case 'heartbeat':
        this.onHeartbeat(m);
        break;
      case 'point':
        this.onPoint(m);
        break;
      case 'end':
        this.onEnd(m);
        break;
      case 'ack':
        this.onAck(m.command, m.sweepId);
        break;
      case 'nak':
        this.onNak(m.command, `${m.code} ${m.text}`);
        break;
      case 'error':
        this.deps.log(`tracer: error ${m.code}: ${m.text}`);
        if (this.active) {
          this.active.lastError = `${m.code} ${m.text}`;
          if (this.active.phase === 'ending') this.settle();
        }
        break;
      case 'zeroed':
        this.deps.log(
          `tracer: zeroed, offsets Ia ${m.iaOffsetMilliamps} mA Ig2 ${m.ig2OffsetMilliamps} mA`,
        );
        break;
      case 'ident':
      case 'caps':
        this.deps.log(`tracer: unexpected ${m.type} outside the handshake (did it restart?)`);
        break;
    }
  }

  /** The tracer link is up again; heartbeats from before it no longer describe the bench. */
  onDeviceReady(): void {
    this.lastBeat = null;
  }

  /** The tracer link went down. */
  onDeviceDown(reason: string): void {
    this.settle();
    const a = this.active;
    if (a) {
      this.end(
        'link-lost',
        `lost the serial link to the tracer (${reason}) after ${points(a.nextSeq)}; the ` +
          "tracer's watchdog switches its outputs off",
      );
    } else this.sendStatus();
  }

  /** The hub connection was lost: outputs off at once, and a running sweep ends. */
  onHubLost(reason: string): void {
    this.settle();
    const sent = this.deps.device.send({ type: 'off' });
    this.deps.log(
      sent
        ? 'safety: hub lost, tracer outputs switched off'
        : 'safety: hub lost; the tracer is not connected (its watchdog keeps outputs off)',
    );
    const a = this.active;
    if (a) {
      this.end(
        'link-lost',
        `lost the hub connection (${reason}) after ${points(a.nextSeq)}; the bridge switched ` +
          'the outputs off',
      );
    }
  }

  /** A valid message from the hub. */
  onHubMessage(m: HubToBridge): void {
    switch (m.type) {
      case 'welcome':
        this.deps.log(`hub: welcome, this is bench ${m.benchName} (id ${m.benchId})`);
        break;
      case 'start-sweep':
        this.start(m.sweepId, m.plan);
        break;
      case 'abort-sweep':
        this.abort(m.sweepId);
        break;
      case 'outputs-off':
        this.outputsOff();
        break;
      case 'ack-points':
        this.deps.journal.ackPoints(m.sweepId, m.throughSeq);
        break;
      case 'ack-end':
        this.deps.journal.ackEnd(m.sweepId);
        break;
      case 'start-check':
      case 'abort-check':
        // CheckControl's; the bridge routes them there.
        break;
    }
  }

  /** A hub message that failed validation; a malformed start is refused, never run. */
  onInvalidHubMessage(raw: unknown, problem: string): void {
    const r = raw as { type?: unknown; sweepId?: unknown } | undefined;
    this.deps.log(`hub: ignoring an invalid message: ${problem}`);
    const id = r?.sweepId;
    if (r?.type === 'start-sweep' && Number.isSafeInteger(id) && id !== this.active?.sweepId) {
      this.refuse(r.sweepId as number, `malformed start-sweep: ${problem}`);
    }
    if (r?.type === 'abort-sweep' || r?.type === 'outputs-off') this.outputsOff();
  }

  /** The bridge is stopping: outputs off, and a running sweep ends 'aborted'. */
  shutDown(): void {
    this.settle();
    this.deps.device.send({ type: 'off' });
    if (this.active)
      this.end('aborted', `the bridge was stopped after ${points(this.active.nextSeq)}`);
  }

  private start(sweepId: number, plan: SweepPlan): void {
    const { device, journal } = this.deps;
    if (this.active?.sweepId === sweepId || journal.get(sweepId)) {
      // A repeated start (the hub resending): the sweep's own messages answer it.
      this.deps.log(`sweep ${sweepId}: ignoring a repeated start; it already ran or runs here`);
      return;
    }
    if (this.active) {
      this.refuse(sweepId, `the bench is busy with sweep ${this.active.sweepId}`);
      return;
    }
    const check = this.deps.activeCheckId?.() ?? null;
    if (check !== null) {
      this.refuse(sweepId, `the bench is busy with quick-test check ${check}`);
      return;
    }
    const caps = device.caps;
    if (!device.ready || !caps) {
      this.refuse(sweepId, 'the tracer is not connected');
      return;
    }
    if (sectionOf(plan) === 2 && !device.extensions?.features.includes('section-select')) {
      this.refuse(
        sweepId,
        'the plan measures section 2, and the tracer has no section switch (SEC in its EXT answer)',
      );
      return;
    }
    const problems = checkPlan(plan, limitsFromDevice(caps));
    if (problems.length) {
      const list = problems.map((p) => `${p.field}: ${p.message}`).join('; ');
      this.refuse(sweepId, `the plan is outside the tracer's limits and was not sent: ${list}`);
      return;
    }
    const heaterSet =
      this.lastBeat !== null &&
      Math.abs(this.lastBeat.heaterVolts - plan.heaterVolts) <= HEATER_TOLERANCE_VOLTS;
    this.active = {
      ...newRun('heater'),
      sweepId,
      plan,
      nextSeq: 0,
      heaterChanged: !heaterSet,
      lastError: null,
    };
    this.deps.log(`sweep ${sweepId}: starting on the tracer`);
    if (heaterSet) this.sendSweep();
    else {
      device.send({ type: 'heater', volts: plan.heaterVolts });
      this.arm(`the tracer did not answer the heater command`);
    }
  }

  private sendSweep(): void {
    const a = this.active!;
    a.phase = 'start';
    this.deps.device.send({ type: 'sweep', sweepId: a.sweepId, plan: a.plan });
    this.arm('the tracer did not answer the start command');
  }

  /** Refuses the starting sweep with this text if the tracer stays silent. */
  private arm(what: string): void {
    const a = this.active!;
    const ms = this.deps.commandTimeoutMs;
    armTimer(a, ms, () => {
      if (this.active !== a) return;
      if (a.phase === 'aborting') {
        this.deps.device.send({ type: 'off' });
        this.end('aborted', `${what} within ${ms} ms; the bridge switched the outputs off`);
      } else {
        this.refuse(a.sweepId, `${what} within ${ms} ms; outputs switched off`, true);
      }
    });
  }

  private onAck(command: string, sweepId: number | undefined): void {
    const a = this.active;
    if (!a) return;
    if (command === 'HTR' && a.phase === 'heater') this.sendSweep();
    else if (command === 'SWP' && a.phase === 'start' && sweepId === a.sweepId) this.accepted(a);
  }

  private onNak(command: string, reason: string): void {
    const a = this.active;
    this.deps.log(`tracer: refused ${command}: ${reason}`);
    if (!a) return;
    if (command === 'HTR' && a.phase === 'heater') {
      this.refuse(a.sweepId, `the tracer refused the heater setting: ${reason}`, true);
    } else if (command === 'SWP' && a.phase === 'start') {
      this.refuse(a.sweepId, `the tracer refused the plan: ${reason}`, a.heaterChanged);
    } else if (command === 'ABT' && a.phase === 'aborting') {
      this.deps.device.send({ type: 'off' });
      this.end('aborted', `the tracer refused the abort (${reason}); outputs switched off`);
    }
  }

  private accepted(a: ActiveSweep): void {
    disarm(a);
    a.phase = 'running';
    this.deps.journal.begin(a.sweepId);
    this.deps.sendToHub({ type: 'sweep-started', sweepId: a.sweepId });
    this.deps.log(`sweep ${a.sweepId}: started`);
    this.sendStatus();
  }

  private onHeartbeat(m: Heartbeat): void {
    this.lastBeat = m;
    const a = this.active;
    if (a && endWentMissing(a, m)) {
      this.deps.device.send({ type: 'off' });
      this.end(
        'fault',
        `the tracer went ${m.state} after ${points(a.nextSeq)} without an end of sweep ` +
          '(a line lost on the serial link); outputs switched off',
      );
      return;
    }
    this.sendStatus();
  }

  private onPoint(m: Point): void {
    const a = this.active;
    if (!a || a.sweepId !== m.sweepId || a.phase === 'heater' || a.phase === 'ending') {
      this.stray(m.sweepId, 'points');
      return;
    }
    // The ACK itself was lost on the line, but the tracer is evidently running the sweep.
    if (a.phase === 'start') this.accepted(a);
    if (m.seq < a.nextSeq) {
      this.deps.log(`sweep ${a.sweepId}: ignoring repeated point ${m.seq}`);
      return;
    }
    if (m.seq > a.nextSeq) {
      this.deps.device.send({ type: 'off' });
      this.end(
        'fault',
        `lost ${pointRange(a.nextSeq, m.seq - 1)} on the serial link (a corrupted line from the ` +
          `tracer); the bridge stopped the sweep and switched the outputs off; ` +
          `${points(a.nextSeq)} kept`,
      );
      return;
    }
    const point: SweepPoint = {
      seq: m.seq,
      curve: m.curve,
      vaVolts: m.vaVolts,
      vg1Volts: m.vg1Volts,
      vg2Volts: m.vg2Volts,
      iaMilliamps: m.iaMilliamps,
      ig2Milliamps: m.ig2Milliamps,
    };
    this.deps.journal.addPoint(a.sweepId, point);
    a.nextSeq++;
    this.deps.sender.pointAdded(a.sweepId);
    if (readingTrips(a.plan, m.vaVolts, m.iaMilliamps)) {
      this.deps.device.send({ type: 'off' });
      const watts = (m.vaVolts * m.iaMilliamps) / 1000;
      this.end(
        'limit',
        `bridge trip at point ${m.seq}: Ia ${num(m.iaMilliamps)} mA at Va ${num(m.vaVolts)} V ` +
          `(${num(watts)} W) is beyond the trip of ${num(a.plan.iaTripMilliamps)} mA or ` +
          `${num(a.plan.paMaxWatts * TRIP_MARGIN)} W; the bridge switched the outputs off`,
      );
    }
  }

  private onEnd(m: End): void {
    const a = this.active;
    if (!a || a.sweepId !== m.sweepId || a.phase === 'heater' || a.phase === 'ending') {
      this.stray(m.sweepId, 'an end');
      return;
    }
    if (a.phase === 'start') this.accepted(a);
    const settleNow = holdEnd(a, m, a.lastError !== null, () => {
      if (this.active === a) this.settle();
    });
    if (settleNow) this.settle();
  }

  /** Ends the sweep as the tracer reported, once the tracer has sent its END. */
  private settle(): void {
    const a = this.active;
    const m = a?.heldEnd;
    if (!a || !m) return;
    let reason: SweepEndReason = m.reason;
    let message = endMessage(m, a);
    if (m.count > a.nextSeq) {
      // The tail went missing on the line: the same policy as a gap.
      if (reason === 'complete') reason = 'fault';
      message += `; lost ${pointRange(a.nextSeq, m.count - 1)} on the serial link`;
    } else if (m.count < a.nextSeq) {
      message += `; the tracer counted ${m.count} points, the bridge received ${a.nextSeq}`;
    }
    this.end(reason, message);
  }

  private abort(sweepId: number): void {
    this.settle();
    const a = this.active;
    if (a && a.sweepId === sweepId && (a.phase === 'running' || a.phase === 'aborting')) {
      this.deps.device.send({ type: 'abort', sweepId });
      if (a.phase === 'running') {
        a.phase = 'aborting';
        a.abortRequested = true;
        this.arm('the tracer did not confirm the abort');
      }
      this.deps.log(`sweep ${sweepId}: abort requested`);
      return;
    }
    // Not (yet) running, or the hub means a sweep the bridge does not know: switch everything
    // off anyway, since whoever pressed abort may be seeing something wrong on the bench.
    this.deps.device.send({ type: 'off' });
    if (a) {
      const because =
        a.sweepId === sweepId
          ? 'before the tracer started it'
          : `(the hub asked for sweep ${sweepId})`;
      this.end('aborted', `aborted ${because}; outputs switched off`);
    } else
      this.deps.log(`hub: abort of sweep ${sweepId}, which is not running; outputs switched off`);
  }

  private outputsOff(): void {
    this.settle();
    this.deps.device.send({ type: 'off' });
    this.deps.log('hub: outputs off requested');
    const a = this.active;
    if (a) this.end('aborted', `outputs switched off on request after ${points(a.nextSeq)}`);
  }

  private refuse(sweepId: number, message: string, outputsOff = false): void {
    const a = this.active;
    if (a && a.sweepId === sweepId) {
      disarm(a);
      this.active = null;
    }
    if (outputsOff) this.deps.device.send({ type: 'off' });
    this.deps.log(`sweep ${sweepId}: refused: ${message}`);
    this.deps.sendToHub({ type: 'sweep-refused', sweepId, message });
    this.sendStatus();
  }

  /** Ends the active sweep: journaled first, so the hub learns of it even after a reconnect. */
  private end(reason: SweepEndReason, message: string): void {
    const a = this.active;
    if (!a) return;
    disarm(a);
    this.active = null;
    this.deps.journal.end(a.sweepId, { reason, count: a.nextSeq, message });
    this.deps.log(`sweep ${a.sweepId}: ended ${reason}: ${message}`);
    this.deps.sender.flush();
    this.sendStatus();
    // A fresh heartbeat, so the hub does not show the supplies live until the next one.
    this.deps.device.send({ type: 'status' });
  }

  private stray(sweepId: number, what: string): void {
    if (this.strayLogged.has(sweepId)) return;
    this.strayLogged.add(sweepId);
    this.deps.log(`tracer: ignoring ${what} of sweep ${sweepId}, which this bridge is not running`);
  }

  private sendStatus(): void {
    this.deps.sendToHub({ type: 'status', status: this.status() });
  }
}

function endMessage(m: End, a: ActiveSweep): string {
  const detail = a.lastError ? ` (${a.lastError})` : '';
  switch (m.reason) {
    case 'complete':
      return `complete, ${points(m.count)}`;
    case 'aborted':
      return a.abortRequested
        ? `aborted on request after ${points(m.count)}`
        : `aborted on the tracer after ${points(m.count)}${detail}`;
    case 'limit':
      return `the tracer tripped on a reading beyond the plan's trip limit${detail}; outputs off`;
    case 'fault':
      return `the tracer reported a fault${detail}; outputs off`;
    case 'link-lost':
      return `the tracer's watchdog expired (no keep-alive from the bridge)${detail}; outputs off`;
  }
}
