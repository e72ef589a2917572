import { buildAnodeFamily } from '../../../shared/analysis/index';
import type { SweepPlan, SweepPoint } from '../../../shared/domain/sweep';
import type { OperatingPointView } from '../types/types-api';

/** One figure at an operating point, measured and published, in the units of `unit`. */
export interface FigureComparison {
  figure: 'Ia' | 'gm' | 'ra' | 'mu';
  unit: 'mA' | 'mA/V' | 'kΩ' | '';
  measured: number | null;
  /** The data sheet's figure, or null where none is published. */
  nominal: number | null;
  /** Measured as a percentage of nominal, %. */
  percent: number | null;
}

/** A measured family read at one of the type's typical operating points. */
export interface OperatingPointFigures {
  point: OperatingPointView;
  /** Ia, gm, ra and mu; empty when the family cannot answer there. */
  figures: FigureComparison[];
  /** Why there are no figures, or null. */
  refusal: string | null;
  /** How far a cut curve was carried past its last reading to the point, V (0: none). */
  extendedVolts: number;
}

/** How far a sweep's screen voltage may be from an operating point's: 2 V or 2 %, V. */
function screenToleranceVolts(vg2Volts: number): number {
  return Math.max(2, 0.02 * vg2Volts);
}

/** A finite number or null: a flat pentode curve's ra is infinite, shown as unknown. */
function finite(x: number): number | null {
  return Number.isFinite(x) ? x : null;
}

function percentOf(measured: number | null, nominal: number | null): number | null {
  return measured !== null && nominal !== null && nominal > 0 ? (100 * measured) / nominal : null;
}

/**
 * Ia, gm, ra and mu of a measured anode family at each typical operating point of its type, by
 * interpolation of the measured curves (the hub takes the reference point's figures the same
 * way), beside the published figures. A point the family does not cover, or whose screen
 * voltage the sweep did not run, gets the reason instead.
 */
export function figuresAtOperatingPoints(
  operatingPoints: readonly OperatingPointView[],
  plan: SweepPlan,
  points: readonly SweepPoint[],
): OperatingPointFigures[] {
  if (!operatingPoints.length) return [];
  const refused = (point: OperatingPointView, refusal: string): OperatingPointFigures => ({
    point,
    figures: [],
    refusal,
    extendedVolts: 0,
  });
  if (plan.kind !== 'anode') {
    return operatingPoints.map((p) => refused(p, 'figures come from anode-family sweeps only'));
  }
  const built = buildAnodeFamily(points);
  return operatingPoints.map((point) => {
    if (
      point.vg2Volts !== null &&
      Math.abs(plan.vg2Volts - point.vg2Volts) > screenToleranceVolts(point.vg2Volts)
    ) {
      return refused(
        point,
        `the sweep ran the screen at ${plan.vg2Volts} V; this point needs ${point.vg2Volts} V`,
      );
    }
    if (!built.ok) return refused(point, built.reason);
    const op = built.family.operatingPoint(point.vaVolts, point.vg1Volts);
    if (!op.ok) return refused(point, op.reason);
    const ia = op.iaMilliamps.value;
    const gm = op.gmMicrosiemens.value / 1000;
    const ra = finite(op.raKiloohms.value);
    const mu = finite(op.mu.value);
    const nominalGm = point.gmMicrosiemens === null ? null : point.gmMicrosiemens / 1000;
    return {
      point,
      refusal: null,
      extendedVolts: op.extendedVolts,
      figures: [
        {
          figure: 'Ia',
          unit: 'mA',
          measured: ia,
          nominal: point.iaMilliamps,
          percent: percentOf(ia, point.iaMilliamps),
        },
        {
          figure: 'gm',
          unit: 'mA/V',
          measured: gm,
          nominal: nominalGm,
          percent: percentOf(gm, nominalGm),
        },
        {
          figure: 'ra',
          unit: 'kΩ',
          measured: ra,
          nominal: point.raKiloohms,
          percent: percentOf(ra, point.raKiloohms),
        },
        {
          figure: 'mu',
          unit: '',
          measured: mu,
          nominal: point.mu,
          percent: percentOf(mu, point.mu),
        },
      ],
    };
  });
}

/** An operating point in words, e.g. "Va 250 V, Vg2 250 V, Vg1 -13.5 V". */
export function operatingPointText(point: {
  vaVolts: number;
  vg2Volts: number | null;
  vg1Volts: number;
}): string {
  const vg2 = point.vg2Volts !== null ? `, Vg2 ${point.vg2Volts} V` : '';
  return `Va ${point.vaVolts} V${vg2}, Vg1 ${point.vg1Volts} V`;
}

/** A figure to three significant digits (0.0545 mA stays readable), or a dash. */
export function figureText(value: number | null): string {
  if (value === null) return '—';
  return Math.abs(value) >= 100
    ? String(Math.round(value * 10) / 10)
    : String(Number(value.toPrecision(3)));
}
