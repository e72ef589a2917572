import { buildAnodeFamily } from '../../shared/analysis/index';
import type { TypicalOperatingPoint } from '../../shared/catalog/valve-types';
import type { SweepPlan, SweepPoint } from '../../shared/domain/sweep';

/** A sweep's figures at a reference operating point: V, mA, µS, kΩ, % of nominal. */
export interface SweepFigures {
  /** Where the figures were taken, V. */
  vaVolts: number;
  vg1Volts: number;
  vg2Volts: number | null;
  /** The type's figures there, mA and µS. */
  nominalIaMilliamps: number;
  nominalGmMicrosiemens: number | null;
  /** Measured figures there; null with a refusal. */
  iaMilliamps: number | null;
  gmMicrosiemens: number | null;
  raKiloohms: number | null;
  mu: number | null;
  /** Measured as % of nominal; null where either is unknown. */
  iaPercent: number | null;
  gmPercent: number | null;
  /** Why there are no measured figures, or null. */
  refusal: string | null;
  /**
   * How far a curve next to the point was carried past its last reading to reach it (a curve
   * the sweep cut at its dissipation or current limit), V; 0 when none was.
   */
  extendedVolts: number;
}

/** How far the sweep's screen voltage may be from the reference point's: 2 V or 2 %. */
function screenTolerance(vg2Volts: number): number {
  return Math.max(2, 0.02 * vg2Volts);
}

/** A finite number, or null (an infinite ra of a flat pentode curve is stored as unknown). */
function finite(x: number): number | null {
  return Number.isFinite(x) ? x : null;
}

/**
 * Figures of a measured anode family at the type's reference operating point, by interpolation
 * of the measured curves (shared/analysis). Refuses, with the reason, for a transfer sweep, a
 * screen voltage other than the point's, or a family that does not cover the point.
 */
export function computeSweepFigures(
  plan: SweepPlan,
  points: readonly SweepPoint[],
  reference: TypicalOperatingPoint,
): SweepFigures {
  const base = {
    vaVolts: reference.vaVolts,
    vg1Volts: reference.vg1Volts,
    vg2Volts: reference.vg2Volts,
    nominalIaMilliamps: reference.iaMilliamps,
    nominalGmMicrosiemens: reference.gmMicrosiemens,
  };
  const refused = (reason: string): SweepFigures => ({
    ...base,
    iaMilliamps: null,
    gmMicrosiemens: null,
    raKiloohms: null,
    mu: null,
    iaPercent: null,
    gmPercent: null,
    refusal: reason,
    extendedVolts: 0,
  });
  if (plan.kind !== 'anode') return refused('figures are taken from anode-family sweeps only');
  if (
    reference.vg2Volts !== null &&
    Math.abs(plan.vg2Volts - reference.vg2Volts) > screenTolerance(reference.vg2Volts)
  ) {
    return refused(
      `the sweep ran the screen at ${plan.vg2Volts} V; the reference point needs ` +
        `${reference.vg2Volts} V`,
    );
  }
  const built = buildAnodeFamily(points);
  if (!built.ok) return refused(built.reason);
  const op = built.family.operatingPoint(reference.vaVolts, reference.vg1Volts);
  if (!op.ok) return refused(op.reason);
  const ia = op.iaMilliamps.value;
  const gm = op.gmMicrosiemens.value;
  const percent = (measured: number, nominal: number | null) =>
    nominal && nominal > 0 ? (100 * measured) / nominal : null;
  return {
    ...base,
    iaMilliamps: ia,
    gmMicrosiemens: gm,
    raKiloohms: finite(op.raKiloohms.value),
    mu: finite(op.mu.value),
    iaPercent: percent(ia, reference.iaMilliamps),
    gmPercent: percent(gm, reference.gmMicrosiemens),
    refusal: null,
    extendedVolts: op.extendedVolts,
  };
}
