import { anodeSteps, type DeviceCapabilities, type SweepPlan } from './sweep';

/** Limits a plan is checked against: the stricter of the device, the bench and the valve type. */
export interface PlanLimits {
  /** Maximum anode voltage, V. */
  vaMaxVolts: number;
  /** Maximum screen voltage, V. */
  vg2MaxVolts: number;
  /** Most negative grid-1 voltage, V. */
  vg1MinVolts: number;
  /** Most positive grid-1 voltage, V. */
  vg1MaxVolts: number;
  /** Maximum anode current, mA. */
  iaMaxMilliamps: number;
  /** Maximum anode dissipation, W. */
  paMaxWatts: number;
  /** Maximum heater voltage, V. */
  heaterMaxVolts: number;
}

/** One reason a plan was refused, naming the plan field at fault. */
export interface PlanProblem {
  /** Plan field that breaks a limit or is malformed. */
  field: keyof SweepPlan;
  /** Human-readable reason, with the figures. */
  message: string;
}

/** Largest number of points one sweep may ask for. */
export const MAX_POINTS_PER_SWEEP = 20000;

/** Limits implied by a device's announced capabilities (no dissipation limit of its own). */
export function limitsFromDevice(caps: DeviceCapabilities): PlanLimits {
  return {
    vaMaxVolts: caps.vaMaxVolts,
    vg2MaxVolts: caps.vg2MaxVolts,
    vg1MinVolts: caps.vg1MinVolts,
    vg1MaxVolts: caps.vg1MaxVolts,
    iaMaxMilliamps: caps.iaMaxMilliamps,
    paMaxWatts: Number.POSITIVE_INFINITY,
    heaterMaxVolts: caps.heaterMaxVolts,
  };
}

/** The stricter of several sets of limits, field by field. */
export function strictestLimits(...sets: PlanLimits[]): PlanLimits {
  return {
    vaMaxVolts: Math.min(...sets.map((s) => s.vaMaxVolts)),
    vg2MaxVolts: Math.min(...sets.map((s) => s.vg2MaxVolts)),
    vg1MinVolts: Math.max(...sets.map((s) => s.vg1MinVolts)),
    vg1MaxVolts: Math.min(...sets.map((s) => s.vg1MaxVolts)),
    iaMaxMilliamps: Math.min(...sets.map((s) => s.iaMaxMilliamps)),
    paMaxWatts: Math.min(...sets.map((s) => s.paMaxWatts)),
    heaterMaxVolts: Math.min(...sets.map((s) => s.heaterMaxVolts)),
  };
}

/**
 * Checks a plan against limits. Returns every problem found (empty when the plan is safe to run).
 * The plan's own current and dissipation limits must not exceed the limits either: the device
 * enforces the plan's figures point by point, so they are the last line of defence.
 */
export function checkPlan(plan: SweepPlan, limits: PlanLimits): PlanProblem[] {
  const problems: PlanProblem[] = [];
  const add = (field: keyof SweepPlan, message: string) => problems.push({ field, message });
  const finite = (x: number) => typeof x === 'number' && Number.isFinite(x);

  for (const f of ['vaStartVolts', 'vaStopVolts', 'vaStepVolts', 'vg2Volts', 'heaterVolts', 'iaMaxMilliamps', 'paMaxWatts', 'iaTripMilliamps', 'warmupSeconds', 'settleMs'] as const) {
    if (!finite(plan[f])) add(f, `${f} must be a finite number`);
  }
  if (problems.length) return problems;
  if (!Array.isArray(plan.vg1Volts) || plan.vg1Volts.length === 0) {
    add('vg1Volts', 'at least one grid-1 voltage is needed');
    return problems;
  }
  if (plan.vg1Volts.some((v) => !finite(v))) add('vg1Volts', 'grid-1 voltages must be finite numbers');

  const vaHigh = plan.kind === 'transfer' ? plan.vaStartVolts : Math.max(plan.vaStartVolts, plan.vaStopVolts);
  if (plan.vaStartVolts < 0) add('vaStartVolts', 'anode voltage cannot be negative');
  if (plan.kind === 'anode') {
    if (plan.vaStepVolts <= 0) add('vaStepVolts', 'anode voltage step must be positive');
    if (plan.vaStopVolts < plan.vaStartVolts) add('vaStopVolts', 'stop voltage is below the start voltage');
  }
  if (vaHigh > limits.vaMaxVolts) {
    add(plan.kind === 'transfer' ? 'vaStartVolts' : 'vaStopVolts', `anode voltage ${vaHigh} V is above the limit of ${limits.vaMaxVolts} V`);
  }
  const vg1Low = Math.min(...plan.vg1Volts);
  const vg1High = Math.max(...plan.vg1Volts);
  if (vg1Low < limits.vg1MinVolts) add('vg1Volts', `grid-1 voltage ${vg1Low} V is below the limit of ${limits.vg1MinVolts} V`);
  if (vg1High > limits.vg1MaxVolts) add('vg1Volts', `grid-1 voltage ${vg1High} V is above the limit of ${limits.vg1MaxVolts} V`);
  if (plan.vg2Volts < 0) add('vg2Volts', 'screen voltage cannot be negative');
  if (plan.vg2Volts > limits.vg2MaxVolts) add('vg2Volts', `screen voltage ${plan.vg2Volts} V is above the limit of ${limits.vg2MaxVolts} V`);
  if (plan.heaterVolts < 0) add('heaterVolts', 'heater voltage cannot be negative');
  if (plan.heaterVolts > limits.heaterMaxVolts) add('heaterVolts', `heater voltage ${plan.heaterVolts} V is above the limit of ${limits.heaterMaxVolts} V`);
  if (plan.iaMaxMilliamps <= 0) add('iaMaxMilliamps', 'current limit must be positive');
  if (plan.iaMaxMilliamps > limits.iaMaxMilliamps) add('iaMaxMilliamps', `current limit ${plan.iaMaxMilliamps} mA is above the limit of ${limits.iaMaxMilliamps} mA`);
  if (plan.paMaxWatts <= 0) add('paMaxWatts', 'dissipation limit must be positive');
  if (plan.paMaxWatts > limits.paMaxWatts) add('paMaxWatts', `dissipation limit ${plan.paMaxWatts} W is above the limit of ${limits.paMaxWatts} W`);
  if (plan.iaTripMilliamps < plan.iaMaxMilliamps) add('iaTripMilliamps', 'trip current must be at least the curve current limit');
  if (plan.iaTripMilliamps > limits.iaMaxMilliamps) add('iaTripMilliamps', `trip current ${plan.iaTripMilliamps} mA is above the limit of ${limits.iaMaxMilliamps} mA`);
  if (plan.warmupSeconds < 0 || plan.warmupSeconds > 600) add('warmupSeconds', 'warm-up must be 0 to 600 s');
  if (plan.settleMs < 0 || plan.settleMs > 10000) add('settleMs', 'settling time must be 0 to 10000 ms');
  if (plan.kind === 'anode' && plan.vaStepVolts > 0 && problems.length === 0) {
    const n = plan.vg1Volts.length * anodeSteps(plan).length;
    if (n > MAX_POINTS_PER_SWEEP) add('vaStepVolts', `plan asks for ${n} points; at most ${MAX_POINTS_PER_SWEEP}`);
  }
  return problems;
}

/** Trip headroom over the curve limits: readings this far beyond them are faults, not clipping. */
export const TRIP_MARGIN = 1.5;

/** Whether a reading has reached the plan's curve limits, so the curve ends there (normal). */
export function readingEndsCurve(plan: SweepPlan, vaVolts: number, iaMilliamps: number): boolean {
  return iaMilliamps >= plan.iaMaxMilliamps || (vaVolts * iaMilliamps) / 1000 >= plan.paMaxWatts;
}

/**
 * Whether a reading trips the sweep (reason "limit", outputs off): above the trip current, or
 * dissipating more than TRIP_MARGIN × the plan's dissipation limit.
 */
export function readingTrips(plan: SweepPlan, vaVolts: number, iaMilliamps: number): boolean {
  return iaMilliamps > plan.iaTripMilliamps || (vaVolts * iaMilliamps) / 1000 > plan.paMaxWatts * TRIP_MARGIN;
}
