import type { DeviceCapabilities } from '../shared/domain/sweep';
import type { DeviceExtensions, HostCommand } from '../shared/protocol';
import type { PlanRefusal } from './plan-admission';
import { STRAPPED_MAX_VOLTS } from './simulated-device';

/** A host command that starts a check. */
export type CheckCommand = Extract<HostCommand, { type: 'leakage' | 'emission' | 'grid-current' }>;

/**
 * Checks the figures of a check command against the tracer's limits: E11 for a malformed one
 * (negative, out-of-range timing), E21 for one outside what the tracer can do. Null: it may run.
 */
export function admitCheck(
  command: CheckCommand,
  caps: DeviceCapabilities,
  extensions: DeviceExtensions,
): PlanRefusal | null {
  const p = command.plan;
  const bad = (text: string): PlanRefusal => ({ code: 'E11', text });
  const outside = (text: string): PlanRefusal => ({ code: 'E21', text });
  if (p.heaterVolts < 0) return bad('heater voltage cannot be negative');
  if (p.warmupSeconds < 0 || p.warmupSeconds > 600) return bad('warm-up must be 0 to 600 s');
  if (p.settleMs < 0 || p.settleMs > 10000) return bad('settling time must be 0 to 10000 ms');
  if (p.heaterVolts > caps.heaterMaxVolts) {
    return outside(`heater voltage ${p.heaterVolts} V is above ${caps.heaterMaxVolts} V`);
  }
  switch (command.type) {
    case 'leakage': {
      for (const { pair, volts } of command.plan.pairs) {
        if (volts < 0) return bad(`test voltage of ${pair} cannot be negative`);
        if (volts > extensions.leakageMaxVolts) {
          return outside(
            `test voltage ${volts} V of ${pair} is above ${extensions.leakageMaxVolts} V`,
          );
        }
      }
      return null;
    }
    case 'emission': {
      const e = command.plan;
      if (e.vaVolts < 0) return bad('anode voltage cannot be negative');
      if (e.iaTripMilliamps <= 0 || e.paMaxWatts <= 0) return bad('trip limits must be positive');
      if (e.vaVolts > STRAPPED_MAX_VOLTS) {
        return outside(
          `anode voltage ${e.vaVolts} V is above ${STRAPPED_MAX_VOLTS} V with grids strapped`,
        );
      }
      if (e.iaTripMilliamps > caps.iaMaxMilliamps) {
        return outside(`trip current ${e.iaTripMilliamps} mA is above ${caps.iaMaxMilliamps} mA`);
      }
      return null;
    }
    case 'grid-current': {
      const g = command.plan;
      if (g.vaVolts < 0 || g.vg2Volts < 0)
        return bad('anode and screen voltage cannot be negative');
      if (g.iaTripMilliamps <= 0 || g.paMaxWatts <= 0) return bad('trip limits must be positive');
      if (g.vaVolts > caps.vaMaxVolts) {
        return outside(`anode voltage ${g.vaVolts} V is above ${caps.vaMaxVolts} V`);
      }
      if (g.vg2Volts > caps.vg2MaxVolts) {
        return outside(`screen voltage ${g.vg2Volts} V is above ${caps.vg2MaxVolts} V`);
      }
      if (g.vg1Volts < caps.vg1MinVolts || g.vg1Volts > caps.vg1MaxVolts) {
        return outside(
          `grid-1 voltage ${g.vg1Volts} V is outside ${caps.vg1MinVolts} to ${caps.vg1MaxVolts} V`,
        );
      }
      if (g.iaTripMilliamps > caps.iaMaxMilliamps) {
        return outside(`trip current ${g.iaTripMilliamps} mA is above ${caps.iaMaxMilliamps} mA`);
      }
      return null;
    }
  }
}
