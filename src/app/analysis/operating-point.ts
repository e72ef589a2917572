import type { AnodeFamily } from '../../../shared/analysis/anode-family';
import type { OperatingPoint } from '../../../shared/analysis/operating-point';
import type { Refusal } from '../../../shared/analysis/refusal';

/** Where the operating-point marker was asked for: by grid voltage or by current. V, mA. */
export type MarkerRequest =
  | { by: 'grid'; vaVolts: number; vg1Volts: number }
  | { by: 'current'; vaVolts: number; iaMilliamps: number };

/** The family's figures at a marker request. */
export function resolveMarker(
  family: AnodeFamily,
  request: MarkerRequest,
): OperatingPoint | Refusal {
  return request.by === 'grid'
    ? family.operatingPoint(request.vaVolts, request.vg1Volts)
    : family.operatingPointAtCurrent(request.vaVolts, request.iaMilliamps);
}

/** The cross-check of mu against gm·ra (IEEE Std 161-1971: mu = gm·ra). */
export interface MuCheck {
  tone: 'ok' | 'warn' | 'neutral';
  sentence: string;
}

/**
 * Compares gm·ra with mu found from the Va shift between curves: they agree when they lie within
 * two combined standard uncertainties of each other.
 */
export function muCheck(op: OperatingPoint): MuCheck {
  if (op.muMethod === 'gm-ra') {
    return {
      tone: 'neutral',
      sentence:
        'mu is gm·ra here: the neighbouring curves do not reach this Ia, so there is no ' +
        'independent check.',
    };
  }
  const gap = op.muFromGmRa.value - op.mu.value;
  const sigma = Math.hypot(op.muFromGmRa.uncertainty, op.mu.uncertainty);
  const percent = Math.abs((100 * gap) / op.mu.value);
  const apart = `${percent < 10 ? percent.toFixed(1) : percent.toFixed(0)} %`;
  if (Math.abs(gap) <= 2 * sigma) {
    return { tone: 'ok', sentence: `Agrees with mu within the uncertainties (${apart} apart).` };
  }
  const sigmas =
    Number.isFinite(sigma) && sigma > 0 ? `, ${(Math.abs(gap) / sigma).toFixed(1)} σ` : '';
  return { tone: 'warn', sentence: `Differs from mu by ${apart}${sigmas}.` };
}

/**
 * A sentence when a curve next to the point was carried past its last reading (a curve the
 * sweep cut at its dissipation or current limit), or null.
 */
export function extensionNote(op: OperatingPoint): string | null {
  if (!(op.extendedVolts > 0)) return null;
  const volts = op.extendedVolts < 10 ? op.extendedVolts.toFixed(1) : op.extendedVolts.toFixed(0);
  return (
    `A neighbouring curve stopped ${volts} V short of this Va (at the sweep's dissipation or ` +
    'current limit) and was carried on along its last slope: these figures are less certain ' +
    'than inside the measurements.'
  );
}
