import { buildAnodeFamily, type AnodeFamily } from '../analysis/anode-family';
import type { OperatingPoint } from '../analysis/operating-point';
import type { Refusal } from '../analysis/refusal';
import type { SweepPoint } from '../domain/sweep';
import type { MatchSurface, SurfaceReading } from './match-surface';

/** A matching surface over a measured anode family from the analysis package. */
export function anodeFamilySurface(family: AnodeFamily): MatchSurface {
  return {
    vg2Volts: family.vg2Volts,
    pointAt: (va, vg1) => reading(family.operatingPoint(va, vg1)),
    pointAtCurrent: (va, ia) => reading(family.operatingPointAtCurrent(va, ia)),
    iaAt: (va, vg1) => {
      const found = family.currentsAt(va, vg1);
      return found.ok ? found.iaMilliamps : null;
    },
  };
}

/** Builds the analysis family of one section's sweep points and wraps it for matching. */
export function surfaceFromSweep(
  points: readonly SweepPoint[],
): { ok: true; surface: MatchSurface } | Refusal {
  const built = buildAnodeFamily(points);
  if (!built.ok) return built;
  return { ok: true, surface: anodeFamilySurface(built.family) };
}

function reading(point: OperatingPoint | Refusal): SurfaceReading | Refusal {
  if (!point.ok) return point;
  return {
    ok: true,
    vg1Volts: point.vg1Volts.value,
    iaMilliamps: point.iaMilliamps.value,
    gmMicrosiemens: point.gmMicrosiemens.value,
  };
}
