import { checkPlan, type PlanLimits } from '../../shared/domain/plan-check';
import type { SweepPlan } from '../../shared/domain/sweep';

/** Limits that accept any figure: checking against them finds only malformed plans. */
const UNBOUNDED: PlanLimits = {
  vaMaxVolts: Number.POSITIVE_INFINITY,
  vg2MaxVolts: Number.POSITIVE_INFINITY,
  vg1MinVolts: Number.NEGATIVE_INFINITY,
  vg1MaxVolts: Number.POSITIVE_INFINITY,
  iaMaxMilliamps: Number.POSITIVE_INFINITY,
  paMaxWatts: Number.POSITIVE_INFINITY,
  heaterMaxVolts: Number.POSITIVE_INFINITY,
};

/** One named set of limits, e.g. the bench's or the valve type's ratings. */
export interface LimitSource {
  /** Words appended to each message, e.g. "12AX7 maximum ratings". */
  label: string;
  limits: PlanLimits;
}

/** Plan problems by field path (`plan.vaStopVolts`), messages joined with "; ". */
export type PlanFieldErrors = Record<string, string>;

/**
 * Checks a plan against each source and names the source in each message, so an operator
 * sees which limit was hit. Problems of the plan itself (a negative step, a trip below the
 * curve limit) are reported once, without a source.
 */
export function planProblems(plan: SweepPlan, sources: readonly LimitSource[]): PlanFieldErrors {
  const fields: PlanFieldErrors = {};
  const add = (field: string, message: string) => {
    const key = `plan.${field}`;
    if (fields[key]?.split('; ').includes(message)) return;
    fields[key] = fields[key] ? `${fields[key]}; ${message}` : message;
  };
  const own = checkPlan(plan, UNBOUNDED);
  const ownMessages = new Set(own.map((p) => p.message));
  for (const p of own) add(p.field, p.message);
  if (own.length > 0) return fields;
  for (const source of sources) {
    for (const p of checkPlan(plan, source.limits)) {
      if (!ownMessages.has(p.message)) add(p.field, `${p.message} (${source.label})`);
    }
  }
  return fields;
}
