import type { PlanLimits } from '../domain/plan-check';
import { checkPlan } from '../domain/plan-check';
import type { CheckPlan } from '../protocol/check-plan';

/**
 * Problems of a check against limits, in words (empty when it is safe to send). A transfer
 * check is a sweep plan and gets checkPlan's problems; the others are held to the same limits
 * for every voltage and current they set. `leakageMaxVolts` is the tracer's leakage supply.
 */
export function checkProblems(
  check: CheckPlan,
  limits: PlanLimits,
  leakageMaxVolts: number | null,
): string[] {
  if (check.kind === 'transfer') {
    return checkPlan(check.plan, limits).map((p) => `${p.field}: ${p.message}`);
  }
  const out: string[] = [];
  const finite = (x: number) => Number.isFinite(x);
  if (!finite(check.heaterVolts) || check.heaterVolts < 0) out.push('heater voltage is invalid');
  else if (check.heaterVolts > limits.heaterMaxVolts) {
    out.push(`heater ${check.heaterVolts} V is above the limit of ${limits.heaterMaxVolts} V`);
  }
  if (check.kind === 'leakage') {
    if (check.pairs.length === 0) out.push('no electrode pair to test');
    for (const { pair, volts } of check.pairs) {
      if (!finite(volts) || volts < 0) out.push(`test voltage of ${pair} is invalid`);
      else if (leakageMaxVolts === null || volts > leakageMaxVolts) {
        out.push(
          `test voltage ${volts} V of ${pair} is above the tracer's ${leakageMaxVolts ?? 0} V`,
        );
      } else if (volts > limits.vaMaxVolts) {
        out.push(`test voltage ${volts} V of ${pair} is above the limit of ${limits.vaMaxVolts} V`);
      }
    }
    return out;
  }
  if (!finite(check.vaVolts) || check.vaVolts < 0) out.push('anode voltage is invalid');
  else if (check.vaVolts > limits.vaMaxVolts) {
    out.push(`anode voltage ${check.vaVolts} V is above the limit of ${limits.vaMaxVolts} V`);
  }
  if (!(check.iaTripMilliamps > 0) || check.iaTripMilliamps > limits.iaMaxMilliamps) {
    out.push(
      `trip current ${check.iaTripMilliamps} mA is not within 0 to ${limits.iaMaxMilliamps} mA`,
    );
  }
  if (!(check.paMaxWatts > 0) || check.paMaxWatts > limits.paMaxWatts) {
    out.push(`dissipation limit ${check.paMaxWatts} W is not within 0 to ${limits.paMaxWatts} W`);
  }
  if (check.kind === 'grid-current') {
    if (check.vg2Volts < 0 || check.vg2Volts > limits.vg2MaxVolts) {
      out.push(`screen voltage ${check.vg2Volts} V is not within 0 to ${limits.vg2MaxVolts} V`);
    }
    if (check.vg1Volts < limits.vg1MinVolts || check.vg1Volts > limits.vg1MaxVolts) {
      out.push(
        `grid-1 voltage ${check.vg1Volts} V is not within ${limits.vg1MinVolts} to ` +
          `${limits.vg1MaxVolts} V`,
      );
    }
  }
  return out;
}
