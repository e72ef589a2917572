import { checkPlan, limitsFromDevice, type PlanLimits } from '../shared/domain/plan-check';
import type { DeviceCapabilities, SweepPlan } from '../shared/domain/sweep';
import type { DeviceErrorCode } from '../shared/protocol';

/* Limits that only catch malformed plans; anything they pass but the device refuses is E21. */
const OPEN_LIMITS: PlanLimits = {
  vaMaxVolts: Infinity,
  vg2MaxVolts: Infinity,
  vg1MinVolts: -Infinity,
  vg1MaxVolts: Infinity,
  iaMaxMilliamps: Infinity,
  paMaxWatts: Infinity,
  heaterMaxVolts: Infinity,
};

/** Why the device refuses a plan: E11 for a malformed plan, E21 for one outside its limits. */
export interface PlanRefusal {
  /** Error code for the NAK. */
  code: Extract<DeviceErrorCode, 'E11' | 'E21'>;
  /** First problem found, with its figures. */
  text: string;
}

/** Checks a plan the host sent against the device's own limits; null when it may run. */
export function admitPlan(plan: SweepPlan, caps: DeviceCapabilities): PlanRefusal | null {
  const malformed = checkPlan(plan, OPEN_LIMITS);
  if (malformed.length) return { code: 'E11', text: malformed[0].message };
  const outside = checkPlan(plan, limitsFromDevice(caps));
  if (outside.length) return { code: 'E21', text: outside[0].message };
  return null;
}
