import type { SweepPoint } from '../../shared/domain/sweep';

/** A family as curves of at most `max` [Va, Ia] points each (every k-th point, ends kept). */
export function downsampledCurves(
  family: readonly SweepPoint[],
  max: number,
): { vg1Volts: number; points: [number, number][] }[] {
  const curves = new Map<number, SweepPoint[]>();
  for (const p of family) curves.set(p.curve, [...(curves.get(p.curve) ?? []), p]);
  return [...curves.entries()]
    .sort((a, b) => a[0] - b[0])
    .map(([, pts]) => {
      const step = Math.max(1, Math.ceil(pts.length / max));
      const kept = pts.filter((_, i) => i % step === 0 || i === pts.length - 1);
      return {
        vg1Volts: pts[0].vg1Volts,
        points: kept.map((p) => [p.vaVolts, p.iaMilliamps] as [number, number]),
      };
    });
}
