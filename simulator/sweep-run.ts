import { readingEndsCurve, readingTrips } from '../shared/domain/plan-check';
import {
  plannedPointCount,
  sectionOf,
  type SweepEndReason,
  type SweepPlan,
} from '../shared/domain/sweep';
import type { DeviceErrorCode, DeviceMessage } from '../shared/protocol';
import { CURRENT_RANGES_MILLIAMPS } from './current-adc';
import type { SimClock, SimTimer } from './sim-clock';
import {
  CONVERSION_MS,
  CURVE_RESET_MS,
  ELECTRODE_CHECK_VOLTS,
  SHORT_MAX_VOLTS,
} from './simulated-device';
import { SweepCursor } from './sweep-cursor';
import type { LastReading } from './tracer-snapshot';
import type { ValveSocket } from './valve-socket';

/** Most readings taken in one timer callback, so a late timer cannot stall the event loop. */
const MAX_READINGS_PER_TICK = 500;

/** What a sweep run needs from the tracer around it. */
export interface SweepRunHost {
  /** Sends a device message to the host. */
  send(message: DeviceMessage): void;
  /** The anode and screen supplies have gone live. */
  highVoltageOn(): void;
  /** Every reading taken, for the control API. */
  reading(reading: LastReading): void;
  /** The run ended by itself; with a code the tracer must switch everything off and send ERR. */
  finished(reason: SweepEndReason, code?: DeviceErrorCode, text?: string): void;
}

/**
 * One sweep from ACK to END: warm-up (supplies off), an electrode check at low anode voltage,
 * then the readings, each settleMs plus CONVERSION_MS of simulated time after the last.
 */
export class SweepRun {
  /** Warm-up or measuring. */
  phase: 'warming' | 'measuring' = 'warming';
  /** Points sent so far. */
  count = 0;
  /** Points the plan asks for at most. */
  readonly plannedPoints: number;
  /** Simulated time the warm-up ends, ms. */
  readonly warmEndMs: number;
  private readonly cursor: SweepCursor;
  private nextDueMs = 0;
  private timer: SimTimer | null = null;
  private done = false;

  constructor(
    readonly id: number,
    readonly plan: SweepPlan,
    private readonly clock: SimClock,
    private readonly socket: ValveSocket,
    private readonly host: SweepRunHost,
  ) {
    this.cursor = new SweepCursor(plan);
    this.plannedPoints = plannedPointCount(plan);
    this.warmEndMs = clock.now() + plan.warmupSeconds * 1000;
  }

  /** Starts the warm-up timer. */
  start(): void {
    this.timer = this.clock.setTimer(this.warmEndMs - this.clock.now(), () =>
      this.beginMeasuring(),
    );
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

  /* The electrode check comes before the high-voltage supplies, so a shorted valve never sees
   * them. */
  private beginMeasuring(): void {
    if (this.done) return;
    const lowestGrid = Math.min(...this.plan.vg1Volts);
    const check = this.socket.read(ELECTRODE_CHECK_VOLTS, lowestGrid, 0, this.warmEndMs);
    if (check.overRange) {
      const text = `short circuit: over range at the ${ELECTRODE_CHECK_VOLTS} V electrode check`;
      this.finish('fault', 'E31', text);
      return;
    }
    this.phase = 'measuring';
    this.host.highVoltageOn();
    this.nextDueMs = this.warmEndMs + this.readingMs();
    this.runDueReadings();
  }

  /* Readings are timed on the simulated clock. When wall-clock timers lag at high speed the
   * due readings are taken in a batch, each at its own simulated time, so the results do not
   * depend on timer jitter. */
  private runDueReadings(): void {
    this.timer = null;
    for (let taken = 0; taken < MAX_READINGS_PER_TICK; taken++) {
      if (this.done || this.nextDueMs > this.clock.now()) break;
      this.takeReading();
    }
    if (!this.done) {
      const delayMs = this.nextDueMs - this.clock.now();
      this.timer = this.clock.setTimer(delayMs, () => this.runDueReadings());
    }
  }

  private takeReading(): void {
    const setting = this.cursor.current();
    if (!setting) {
      this.finish('complete');
      return;
    }
    const { plan } = this;
    const { vaVolts, vg1Volts } = setting;
    const atMs = this.nextDueMs;
    const r = this.socket.read(vaVolts, vg1Volts, plan.vg2Volts, atMs, sectionOf(plan) - 1);
    this.host.reading({
      sweepId: this.id,
      vaVolts,
      vg1Volts,
      vg2Volts: plan.vg2Volts,
      iaMilliamps: r.iaMilliamps,
      ig2Milliamps: r.ig2Milliamps,
      gridCurrentMicroamps: r.gridCurrentMicroamps,
      emission: r.emission,
    });
    if (r.overRange && vaVolts <= SHORT_MAX_VOLTS) {
      const top = CURRENT_RANGES_MILLIAMPS[CURRENT_RANGES_MILLIAMPS.length - 1];
      this.finish('fault', 'E31', `short circuit: over ${top} mA at ${vaVolts} V`);
      return;
    }
    this.host.send({
      type: 'point',
      sweepId: this.id,
      seq: this.count,
      curve: setting.curve,
      vaVolts,
      vg1Volts,
      vg2Volts: plan.vg2Volts,
      iaMilliamps: r.iaMilliamps,
      ig2Milliamps: r.ig2Milliamps,
    });
    this.count++;
    if (readingTrips(plan, vaVolts, r.iaMilliamps)) {
      const watts = ((vaVolts * r.iaMilliamps) / 1000).toFixed(2);
      const text = `trip: Ia ${r.iaMilliamps.toFixed(3)} mA (${watts} W) at ${vaVolts} V`;
      this.finish('limit', 'E20', text);
      return;
    }
    const newCurve = this.cursor.advance(readingEndsCurve(plan, vaVolts, r.iaMilliamps));
    if (!this.cursor.current()) {
      this.finish('complete');
      return;
    }
    this.nextDueMs = atMs + this.readingMs() + (newCurve ? CURVE_RESET_MS : 0);
  }

  private readingMs(): number {
    return this.plan.settleMs + CONVERSION_MS;
  }

  private finish(reason: SweepEndReason, code?: DeviceErrorCode, text?: string): void {
    this.cancel();
    this.host.finished(reason, code, text);
  }
}
