import type { ValveTypeView } from '../core/valve-types-api';

interface StoredPoint {
  label?: string;
  vaVolts?: number;
  vg1Volts?: number;
  vg2Volts?: number;
  iaMilliamps?: number;
}

/**
 * Where each operating point of stored criteria lies, in words by point label ("Va 250 V,
 * Vg1 -13.5 V, Vg2 250 V"). Criteria without points or a window were matched at the type's
 * reference point, which the hub labels "typical".
 */
export function pointConditions(
  criteria: Record<string, unknown>,
  type: ValveTypeView | null,
): Map<string, string> {
  const out = new Map<string, string>();
  const given = criteria['operatingPoints'] as StoredPoint[] | undefined;
  if (given === undefined && !criteria['window']) {
    const op = type?.operatingPoints[0];
    if (op) {
      const { vaVolts, vg1Volts, vg2Volts } = op;
      out.set('typical', describe({ vaVolts, vg1Volts, vg2Volts: vg2Volts ?? undefined }));
    }
    return out;
  }
  (given ?? []).forEach((p, i) => out.set(p.label?.trim() || `point ${i + 1}`, describe(p)));
  return out;
}

function describe(p: StoredPoint): string {
  const parts = [`Va ${p.vaVolts} V`];
  if (p.vg1Volts !== undefined) parts.push(`Vg1 ${p.vg1Volts} V`);
  if (p.iaMilliamps !== undefined) parts.push(`Ia ${p.iaMilliamps} mA`);
  if (p.vg2Volts !== undefined) parts.push(`Vg2 ${p.vg2Volts} V`);
  return parts.join(', ');
}
