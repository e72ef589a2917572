import { limitsFromDevice, readingTrips, TRIP_MARGIN } from '../shared/domain/plan-check';
import type { SweepEndReason } from '../shared/domain/sweep';
import { checkProblems } from '../shared/grading/check-limits';
import type { BridgeToHub, HubToBridge } from '../shared/hub/messages';
import {
  checkCommand,
  checkCommandTag,
  checkReadingOf,
  featureOfCheck,
  type CheckPlan,
  type CheckReading,
} from '../shared/protocol/check-plan';
import { num, type DeviceErrorCode, type DeviceMessage } from '../shared/protocol/messages';
import type { DeviceLink } from './device-link';
import { armTimer, disarm, endWentMissing, holdEnd, newRun, type TracerRun } from './tracer-run';

type End = Extract<DeviceMessage, { type: 'end' }>;
type Heartbeat = Extract<DeviceMessage, { type: 'heartbeat' }>;

/** The check the bridge looks after (TracerRun has its phase, timer and held END). */
interface ActiveCheck extends TracerRun {
  checkId: number;
  check: CheckPlan;
  readings: CheckReading[];
  /** Next seq expected of a transfer check's points. */
  nextSeq: number;
  /** Last ERR the tracer reported during the check. */
  lastError: { code: DeviceErrorCode; text: string } | null;
}

/** What CheckControl works with. */
export interface CheckControlDeps {
  device: DeviceLink;
  log: (line: string) => void;
  sendToHub: (m: BridgeToHub) => boolean;
  /** Sends the bench status to the hub (it carries the running check's id). */
  reportStatus: () => void;
  /** Sweep the bench is starting or running, or null: a check then waits its turn. */
  activeSweepId: () => number | null;
  /** Wait for the tracer to answer a check command or ABT, ms. */
  commandTimeoutMs: number;
}

/**
 * Runs checks (the steps of a quick test) for the hub, with the sweep rules where they apply:
 * - A check is refused before anything is sent when the bench is busy, the tracer lacks the
 *   function (its EXT answer) or a figure breaks the tracer's limits (checkProblems).
 * - Every reading is checked here too: a transfer point by readingTrips, an emission or
 *   grid-current reading by its trip current and 1.5 x its dissipation limit. A trip switches
 *   the outputs off at once and ends the check 'limit'.
 * - A seq gap in a transfer check, a result line missing at the END, or an END that never comes
 *   (two idle heartbeats) switches the outputs off and ends the check 'fault'.
 * - Losing the hub switches the outputs off and drops the check: checks are not journaled (a
 *   few readings, repeated in a minute); the hub ends the quick test as 'link-lost' itself.
 */
export class CheckControl {
  private active: ActiveCheck | null = null;

  constructor(private readonly deps: CheckControlDeps) {}

  /** Check being started or run, or null. */
  get activeCheckId(): number | null {
    return this.active?.checkId ?? null;
  }

  /** Whether a device message belongs to the check (heartbeats go to both controls). */
  claims(m: DeviceMessage): boolean {
    const a = this.active;
    switch (m.type) {
      case 'leakage':
      case 'emission':
      case 'grid-current':
        return true;
      case 'ack':
      case 'nak':
        if (m.command === 'LKG' || m.command === 'EMI' || m.command === 'GAS') return true;
        if (!a) return false;
        if (m.command === 'ABT') return a.phase === 'aborting' || a.phase === 'running';
        return m.command === 'SWP' && a.phase === 'start' && a.check.kind === 'transfer';
      case 'point':
      case 'end':
        return a !== null && m.sweepId === a.checkId;
      case 'error':
        return a !== null;
      default:
        return false;
    }
  }

  /** A hub message for checks. */
  onHubMessage(m: Extract<HubToBridge, { type: 'start-check' | 'abort-check' }>): void {
    if (m.type === 'start-check') this.start(m.checkId, m.check);
    else this.abort(m.checkId);
  }

  /** A malformed check message: a start is refused; an abort still switches outputs off. */
  onInvalidHubMessage(raw: { type?: unknown; checkId?: unknown }, problem: string): void {
    const id = raw.checkId;
    if (raw.type === 'start-check' && Number.isSafeInteger(id) && id !== this.active?.checkId) {
      this.refuse(id as number, `malformed start-check: ${problem}`);
    }
    if (raw.type === 'abort-check') {
      this.deps.device.send({ type: 'off' });
      if (this.active) this.end('aborted', 'aborted (a malformed abort); outputs switched off');
    }
  }

  /** A message the check claimed, or a heartbeat. */
  onDeviceMessage(m: DeviceMessage): void {
    switch (m.type) {
      case 'heartbeat':
        this.onHeartbeat(m);
        return;
      case 'ack':
        this.onAck(m.command, m.sweepId);
        return;
      case 'nak':
        this.onNak(m.command, `${m.code} ${m.text}`);
        return;
      case 'end':
        this.onEnd(m);
        return;
      case 'error':
        this.deps.log(`tracer: error ${m.code}: ${m.text}`);
        if (this.active) {
          this.active.lastError = { code: m.code, text: m.text };
          if (this.active.phase === 'ending') this.settle();
        }
        return;
      default: {
        const r = checkReadingOf(m);
        if (r) this.onReading(r.checkId, r.reading);
      }
    }
  }

  /** The tracer link went down: the check ends 'link-lost'. */
  onDeviceDown(reason: string): void {
    this.settle();
    if (this.active) {
      this.end(
        'link-lost',
        `lost the serial link to the tracer (${reason}); the tracer's watchdog switches its ` +
          'outputs off',
      );
    }
  }

  /** The hub is gone: outputs off, and the check is dropped (the hub ends it on its side). */
  onHubLost(): void {
    const a = this.active;
    if (!a) return;
    disarm(a);
    this.active = null;
    this.deps.device.send({ type: 'off' });
    this.deps.log(`check ${a.checkId}: dropped, the hub connection was lost; outputs off`);
  }

  /** The bridge is stopping. */
  shutDown(): void {
    this.settle();
    if (!this.active) return;
    this.deps.device.send({ type: 'off' });
    this.end('aborted', 'the bridge was stopped; outputs switched off');
  }

  private start(checkId: number, check: CheckPlan): void {
    const { device } = this.deps;
    if (this.active?.checkId === checkId) {
      this.deps.log(`check ${checkId}: ignoring a repeated start`);
      return;
    }
    if (this.active) {
      this.refuse(checkId, `the bench is busy with check ${this.active.checkId}`);
      return;
    }
    const sweep = this.deps.activeSweepId();
    if (sweep !== null) {
      this.refuse(checkId, `the bench is busy with sweep ${sweep}`);
      return;
    }
    const caps = device.caps;
    if (!device.ready || !caps) {
      this.refuse(checkId, 'the tracer is not connected');
      return;
    }
    const feature = featureOfCheck(check.kind);
    const ext = device.extensions;
    if (feature && !ext?.features.includes(feature)) {
      this.refuse(checkId, `the tracer has no ${feature} function (its EXT answer)`);
      return;
    }
    const problems = checkProblems(check, limitsFromDevice(caps), ext?.leakageMaxVolts ?? null);
    if (problems.length) {
      this.refuse(checkId, `outside the tracer's limits, not sent: ${problems.join('; ')}`);
      return;
    }
    this.active = { ...newRun('start'), checkId, check, readings: [], nextSeq: 0, lastError: null };
    this.deps.log(`check ${checkId}: starting ${check.kind} on the tracer`);
    device.send(checkCommand(checkId, check));
    this.arm('the tracer did not answer the check command');
  }

  private arm(what: string): void {
    const a = this.active!;
    const ms = this.deps.commandTimeoutMs;
    armTimer(a, ms, () => {
      if (this.active !== a) return;
      this.deps.device.send({ type: 'off' });
      if (a.phase === 'aborting') {
        this.end('aborted', `${what} within ${ms} ms; the bridge switched the outputs off`);
      } else this.refuse(a.checkId, `${what} within ${ms} ms; outputs switched off`);
    });
  }

  private onAck(command: string, id: number | undefined): void {
    const a = this.active;
    if (!a || id !== a.checkId) return;
    if (a.phase === 'start' && command === checkCommandTag(a.check.kind)) this.accepted(a);
  }

  private onNak(command: string, reason: string): void {
    const a = this.active;
    this.deps.log(`tracer: refused ${command}: ${reason}`);
    if (!a) return;
    if (a.phase === 'start' && command === checkCommandTag(a.check.kind)) {
      this.refuse(a.checkId, `the tracer refused the check: ${reason}`);
    } else if (command === 'ABT' && a.phase === 'aborting') {
      this.deps.device.send({ type: 'off' });
      this.end('aborted', `the tracer refused the abort (${reason}); outputs switched off`);
    }
  }

  private accepted(a: ActiveCheck): void {
    disarm(a);
    a.phase = 'running';
    this.deps.sendToHub({ type: 'check-started', checkId: a.checkId });
    this.deps.log(`check ${a.checkId}: started`);
    this.deps.reportStatus();
  }

  private onHeartbeat(m: Heartbeat): void {
    const a = this.active;
    if (a && endWentMissing(a, m)) {
      this.deps.device.send({ type: 'off' });
      this.end(
        'fault',
        `the tracer went ${m.state} without an end of the check (a line lost on the serial ` +
          'link); outputs switched off',
      );
    }
  }

  private onReading(checkId: number, reading: CheckReading): void {
    const a = this.active;
    if (!a || a.checkId !== checkId || a.phase === 'ending') {
      this.deps.log(`tracer: ignoring a reading of check ${checkId}, which is not running here`);
      return;
    }
    if (a.phase === 'start') this.accepted(a);
    if (reading.kind === 'point') {
      if (reading.seq < a.nextSeq) return;
      if (reading.seq > a.nextSeq) {
        this.deps.device.send({ type: 'off' });
        this.end(
          'fault',
          `lost point ${a.nextSeq} of the check on the serial link (a corrupted line); the ` +
            'bridge switched the outputs off',
        );
        return;
      }
      a.nextSeq++;
    }
    a.readings.push(reading);
    this.deps.sendToHub({ type: 'check-reading', checkId, reading });
    const trip = this.trips(a.check, reading);
    if (trip) {
      this.deps.device.send({ type: 'off' });
      this.end('limit', `bridge trip: ${trip}; the bridge switched the outputs off`);
    }
  }

  /** Why a reading trips the check (as the tracer itself should have), or null. */
  private trips(check: CheckPlan, r: CheckReading): string | null {
    const over = (va: number, ia: number, iaTrip: number, paMax: number) => {
      const watts = (va * ia) / 1000;
      if (ia <= iaTrip && watts <= paMax * TRIP_MARGIN) return null;
      return `Ia ${num(ia)} mA at ${num(va)} V (${num(watts)} W) is beyond the trip of ${num(iaTrip)} mA or ${num(paMax * TRIP_MARGIN)} W`;
    };
    if (check.kind === 'transfer' && r.kind === 'point') {
      return readingTrips(check.plan, r.vaVolts, r.iaMilliamps)
        ? over(r.vaVolts, r.iaMilliamps, check.plan.iaTripMilliamps, check.plan.paMaxWatts)
        : null;
    }
    if (check.kind === 'emission' && r.kind === 'emission') {
      return over(r.vaVolts, r.milliamps, check.iaTripMilliamps, check.paMaxWatts);
    }
    if (check.kind === 'grid-current' && r.kind === 'grid-current') {
      return over(r.vaVolts, r.iaMilliamps, check.iaTripMilliamps, check.paMaxWatts);
    }
    return null;
  }

  private onEnd(m: End): void {
    const a = this.active;
    if (!a || a.checkId !== m.sweepId || a.phase === 'ending') return;
    if (a.phase === 'start') this.accepted(a);
    const settleNow = holdEnd(a, m, a.lastError !== null, () => {
      if (this.active === a) this.settle();
    });
    if (settleNow) this.settle();
  }

  /** Ends the check as the tracer reported, once its END is in. */
  private settle(): void {
    const a = this.active;
    const m = a?.heldEnd;
    if (!a || !m) return;
    let reason: SweepEndReason = m.reason;
    const detail = a.lastError ? ` (${a.lastError.code} ${a.lastError.text})` : '';
    let message = {
      complete: `complete, ${a.readings.length} readings`,
      aborted: a.abortRequested ? 'aborted on request' : `aborted on the tracer${detail}`,
      limit: `the tracer tripped on a reading beyond the check's limits${detail}; outputs off`,
      fault: `the tracer reported a fault${detail}; outputs off`,
      'link-lost': `the tracer's watchdog expired${detail}; outputs off`,
    }[m.reason];
    if (m.count > a.readings.length) {
      if (reason === 'complete') reason = 'fault';
      message += `; lost ${m.count - a.readings.length} result lines on the serial link`;
    }
    this.end(reason, message);
  }

  private abort(checkId: number): void {
    this.settle();
    const a = this.active;
    if (a && a.checkId === checkId && (a.phase === 'running' || a.phase === 'aborting')) {
      this.deps.device.send({ type: 'abort', sweepId: checkId });
      if (a.phase === 'running') {
        a.phase = 'aborting';
        a.abortRequested = true;
        this.arm('the tracer did not confirm the abort');
      }
      this.deps.log(`check ${checkId}: abort requested`);
      return;
    }
    // Not running (yet), or unknown here: everything off all the same.
    this.deps.device.send({ type: 'off' });
    if (a) this.end('aborted', 'aborted before the tracer started it; outputs switched off');
    else
      this.deps.log(`hub: abort of check ${checkId}, which is not running; outputs switched off`);
  }

  private refuse(checkId: number, message: string): void {
    const a = this.active;
    if (a && a.checkId === checkId) {
      disarm(a);
      this.active = null;
    }
    this.deps.log(`check ${checkId}: refused: ${message}`);
    this.deps.sendToHub({ type: 'check-refused', checkId, message });
    this.deps.reportStatus();
  }

  private end(reason: SweepEndReason, message: string): void {
    const a = this.active;
    if (!a) return;
    disarm(a);
    this.active = null;
    this.deps.log(`check ${a.checkId}: ended ${reason}: ${message}`);
    this.deps.sendToHub({
      type: 'check-ended',
      checkId: a.checkId,
      reason,
      message,
      errorCode: a.lastError?.code ?? null,
      readings: a.readings,
    });
    this.deps.reportStatus();
    this.deps.device.send({ type: 'status' });
  }
}
