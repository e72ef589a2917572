import type { SweepEndReason } from '../shared/domain/sweep';
import type { CheckKind, DeviceErrorCode, DeviceMessage } from '../shared/protocol';
import type { SimClock, SimTimer } from './sim-clock';
import { CONVERSION_MS } from './simulated-device';

/** What one step of a check produced: a result line (maybe a trip), or a fault. */
export type CheckStepOutcome =
  { message: DeviceMessage; trip?: string } | { fault: { code: DeviceErrorCode; text: string } };

/** One reading of a check, taken at simulated time `atMs`. */
export type CheckStep = (atMs: number) => CheckStepOutcome;

/** What a check run needs from the tracer around it. */
export interface CheckRunHost {
  /** Sends a device message to the host. */
  send(message: DeviceMessage): void;
  /** A test or supply voltage has gone live. */
  highVoltageOn(): void;
  /** The run ended by itself; with a code the tracer switches everything off and sends ERR. */
  finished(reason: SweepEndReason, code?: DeviceErrorCode, text?: string): void;
}

/** The steps of a check and its timing. */
export interface CheckRunSpec {
  /** Which check (for the control API). */
  kind: CheckKind;
  /** Heater warm-up before the first step, s. */
  warmupSeconds: number;
  /** Settling time before each step, ms. */
  settleMs: number;
  /** Runs after the warm-up, before any step: a fault stops the check there. */
  preCheck?: (atMs: number) => { code: DeviceErrorCode; text: string } | null;
  /** The readings, in order; each sends one result line. */
  steps: CheckStep[];
}

/**
 * One check (LKG, EMI or GAS) from ACK to END: warm-up with the supplies off, an optional
 * electrode check, then one reading per step, each settleMs plus CONVERSION_MS of simulated
 * time after the last. The tracer sends END; a trip or fault ends the run early.
 */
export class CheckRun {
  /** Warm-up or measuring. */
  phase: 'warming' | 'measuring' = 'warming';
  /** Result lines sent so far. */
  count = 0;
  /** Result lines the check will send at most. */
  readonly plannedPoints: number;
  /** Simulated time the warm-up ends, ms. */
  readonly warmEndMs: number;
  private timer: SimTimer | null = null;
  private done = false;
  private next = 0;

  constructor(
    readonly id: number,
    private readonly spec: CheckRunSpec,
    private readonly clock: SimClock,
    private readonly host: CheckRunHost,
  ) {
    this.plannedPoints = spec.steps.length;
    this.warmEndMs = clock.now() + spec.warmupSeconds * 1000;
  }

  /** Which check this is. */
  get kind(): CheckKind {
    return this.spec.kind;
  }

  /** Starts the warm-up timer. */
  start(): void {
    this.timer = this.clock.setTimer(this.warmEndMs - this.clock.now(), () => this.measure());
  }

  /** Stops the run without a word (the tracer sends END). */
  cancel(): void {
    this.done = true;
    this.timer?.cancel();
    this.timer = null;
  }

  /** Whole seconds of warm-up left at `nowMs` (0 once measuring). */
  warmupLeftSeconds(nowMs: number): number {
    if (this.phase !== 'warming') return 0;
    return Math.ceil(Math.max(0, this.warmEndMs - nowMs) / 1000);
  }

  private measure(): void {
    if (this.done) return;
    const fault = this.spec.preCheck?.(this.warmEndMs);
    if (fault) {
      this.finish('fault', fault.code, fault.text);
      return;
    }
    this.phase = 'measuring';
    this.host.highVoltageOn();
    this.schedule(this.warmEndMs);
  }

  private schedule(fromMs: number): void {
    const dueMs = fromMs + this.spec.settleMs + CONVERSION_MS;
    this.timer = this.clock.setTimer(dueMs - this.clock.now(), () => this.step(dueMs));
  }

  private step(atMs: number): void {
    this.timer = null;
    if (this.done) return;
    const step = this.spec.steps[this.next++];
    if (!step) {
      this.finish('complete');
      return;
    }
    const outcome = step(atMs);
    if ('fault' in outcome) {
      this.finish('fault', outcome.fault.code, outcome.fault.text);
      return;
    }
    this.host.send(outcome.message);
    this.count++;
    if (outcome.trip) {
      this.finish('limit', 'E20', outcome.trip);
      return;
    }
    if (this.next >= this.spec.steps.length) this.finish('complete');
    else this.schedule(atMs);
  }

  private finish(reason: SweepEndReason, code?: DeviceErrorCode, text?: string): void {
    this.cancel();
    this.host.finished(reason, code, text);
  }
}
