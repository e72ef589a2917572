/**
 * Domain types of a sweep, shared by app, hub, bridge and simulator.
 * Units are in the names: volts (V), milliamps (mA), watts (W), milliseconds (ms).
 */

/** The kinds of measurement a tracer can run. */
export type SweepKind = 'anode' | 'transfer';

/** A sweep plan: what the tracer is asked to do, and the limits it must hold. */
export interface SweepPlan {
  /** Anode family (Ia against Va at stepped Vg1) or transfer curve (Ia against Vg1 at fixed Va). */
  kind: SweepKind;
  /** Anode family: first anode voltage of each curve, V. Transfer: the fixed anode voltage, V. */
  vaStartVolts: number;
  /** Anode family: last anode voltage, V (ignored for transfer). */
  vaStopVolts: number;
  /** Anode family: anode voltage step, V (ignored for transfer). */
  vaStepVolts: number;
  /**
   * Grid-1 voltages, V (normally zero or negative). Anode family: one curve per entry.
   * Transfer: the points of the single curve, in order.
   */
  vg1Volts: number[];
  /** Screen (grid 2) voltage for tetrodes and pentodes, V; 0 for triodes and diodes. */
  vg2Volts: number;
  /** Heater voltage, V. */
  heaterVolts: number;
  /**
   * Curve current limit, mA: a curve ends at the first reading at or above it (the reading is
   * kept) and the sweep goes on with the next curve. Normal on every family.
   */
  iaMaxMilliamps: number;
  /** Curve dissipation limit, W: a curve ends at the first reading with Va·Ia at or above it. */
  paMaxWatts: number;
  /**
   * Trip current, mA (at least iaMaxMilliamps): any reading above it ends the whole sweep with
   * reason "limit" and switches every output off. It catches shorts and runaway.
   */
  iaTripMilliamps: number;
  /** Heater warm-up before the first reading, s (heater on, anode and screen off). */
  warmupSeconds: number;
  /** Settling time before each reading, ms. */
  settleMs: number;
  /**
   * Section of a multi-section envelope the sweep measures (double triodes: 1 or 2), as the
   * tracer's section switch connects it; absent means section 1.
   */
  section?: 1 | 2;
}

/** The section a plan measures (1 unless it says 2). */
export function sectionOf(plan: Pick<SweepPlan, 'section'>): 1 | 2 {
  return plan.section === 2 ? 2 : 1;
}

/** One measured point of a sweep. */
export interface SweepPoint {
  /** Sequence number within the sweep, 0-based, contiguous. */
  seq: number;
  /** Index of the curve (Vg1 step) this point belongs to, 0-based. */
  curve: number;
  /** Anode voltage, V. */
  vaVolts: number;
  /** Grid-1 voltage, V. */
  vg1Volts: number;
  /** Screen voltage, V. */
  vg2Volts: number;
  /** Anode current, mA. */
  iaMilliamps: number;
  /** Screen current, mA (0 where no screen). */
  ig2Milliamps: number;
}

/** Why a sweep ended. */
export type SweepEndReason = 'complete' | 'aborted' | 'limit' | 'fault' | 'link-lost';

/** Lifecycle state of a sweep record on the hub. */
export type SweepStatus = 'pending' | 'running' | SweepEndReason;

/** Device capabilities and limits, announced in the handshake. */
export interface DeviceCapabilities {
  /** Protocol version the device speaks. */
  protocolVersion: number;
  /** Device model string (free text). */
  model: string;
  /** Device serial number (free text). */
  serial: string;
  /** Firmware version (free text). */
  firmware: string;
  /** Maximum anode voltage, V. */
  vaMaxVolts: number;
  /** Maximum screen voltage, V. */
  vg2MaxVolts: number;
  /** Most negative grid-1 voltage, V. */
  vg1MinVolts: number;
  /** Most positive grid-1 voltage, V. */
  vg1MaxVolts: number;
  /** Maximum anode current the device can measure, mA. */
  iaMaxMilliamps: number;
  /** Maximum heater voltage, V. */
  heaterMaxVolts: number;
  /** Maximum heater current, A. */
  heaterMaxAmps: number;
  /** Whether the device can pulse the anode supply (short measuring pulses). */
  pulse: boolean;
  /** Watchdog period: outputs switch off after this long without a valid host line, ms. */
  watchdogMs: number;
}

/** Counts the number of points a plan will produce at most. */
export function plannedPointCount(plan: SweepPlan): number {
  if (plan.kind === 'transfer') return plan.vg1Volts.length;
  return plan.vg1Volts.length * anodeSteps(plan).length;
}

/** The anode voltages of one curve of an anode-family plan, V, start to stop inclusive. */
export function anodeSteps(plan: SweepPlan): number[] {
  const out: number[] = [];
  const n = Math.floor((plan.vaStopVolts - plan.vaStartVolts) / plan.vaStepVolts + 1e-9);
  for (let i = 0; i <= n; i++) out.push(round(plan.vaStartVolts + i * plan.vaStepVolts, 3));
  return out;
}

function round(x: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(x * f) / f;
}
