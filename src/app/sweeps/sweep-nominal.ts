import { catchError, map, of, switchMap, type Observable } from 'rxjs';
import {
  korenPentodeIa,
  korenTriodeIa,
  type KorenPentodeParams,
  type KorenTriodeParams,
} from '../../../shared/physics/koren';
import type { SweepPlan, SweepPoint } from '../../../shared/domain/sweep';
import type { NominalCurves, TypesApi, TypeView } from '../types/types-api';
import type { ChartOverlay } from './sweep-chart';

/** Points along Va per model curve: smooth at chart size, cheap to draw. */
const MODEL_SAMPLES = 64;

/** Two grid voltages closer than this, V, are the same curve. */
const SAME_GRID_VOLTS = 0.01;

/** One nominal curve: [Va V, Ia mA] pairs at one grid voltage. */
export interface NominalLine {
  vg1Volts: number;
  data: [number, number][];
}

/** What is drawn as the type's nominal: its uploaded curves, or else its published model. */
export interface NominalDrawing {
  from: 'uploaded' | 'model';
  /** Where the curves come from, as the library states it. */
  source: string;
  /** Legend entry of the overlay. */
  legendName: string;
  lines: NominalLine[];
  type: TypeView;
}

/** The library's type for a designation or an equivalent, or null. */
export function typeFor(types: readonly TypeView[], designation: string): TypeView | null {
  const name = designation.trim().toUpperCase();
  return (
    types.find((t) => t.designation.toUpperCase() === name) ??
    types.find((t) => t.equivalents.some((e) => e.toUpperCase() === name)) ??
    null
  );
}

/** Distinct measured grid voltages of an anode family, V, in plan order. */
export function measuredGrids(plan: SweepPlan, points: readonly SweepPoint[]): number[] {
  const curves = new Set(points.map((p) => p.curve));
  return plan.vg1Volts.filter((_, i) => curves.has(i));
}

/** A type of the library with its stored nominal curves (null when they could not be read). */
export interface NominalSource {
  type: TypeView;
  stored: NominalCurves | null;
}

/**
 * The library's type for a sweep's designation and its uploaded nominal curves, or null for an
 * unknown type or when the library cannot be read.
 */
export function loadNominalSource(
  api: TypesApi,
  designation: string | null,
): Observable<NominalSource | null> {
  if (!designation) return of(null);
  return api.list().pipe(
    map((types) => typeFor(types, designation)),
    switchMap((type) =>
      type
        ? api.nominalCurves(type.designation).pipe(
            catchError(() => of(null)),
            map((stored): NominalSource => ({ type, stored })),
          )
        : of(null),
    ),
    catchError(() => of(null)),
  );
}

/**
 * What to draw as the type's nominal: its uploaded curves when there are any, else its published
 * Koren model at each measured Vg1 over the measured Va range; null for a transfer curve or a
 * type with neither.
 */
export function nominalDrawing(
  type: TypeView,
  stored: NominalCurves | null,
  plan: SweepPlan,
  points: readonly SweepPoint[],
): NominalDrawing | null {
  if (plan.kind !== 'anode') return null;
  const uploaded = (stored?.curves ?? []).filter((c) => c.points.length > 1);
  if (uploaded.length) {
    const source = stored?.source ?? 'uploaded curves';
    return {
      from: 'uploaded',
      source,
      legendName: `Nominal (${source})`,
      type,
      lines: uploaded.map((c) => ({
        vg1Volts: c.vg1Volts,
        data: c.points
          .slice()
          .sort((a, b) => a.vaVolts - b.vaVolts)
          .map((p): [number, number] => [p.vaVolts, p.iaMilliamps]),
      })),
    };
  }
  const model = type.model;
  if (!model || !points.length) return null;
  const vas = points.map((p) => p.vaVolts);
  const vaMin = Math.min(...vas);
  const vaMax = Math.max(...vas);
  if (!(vaMax > vaMin)) return null;
  const ia = (va: number, vg1: number) =>
    model.kind === 'pentode'
      ? korenPentodeIa(model.params as unknown as KorenPentodeParams, va, vg1, plan.vg2Volts)
      : korenTriodeIa(model.params as unknown as KorenTriodeParams, va, vg1);
  return {
    from: 'model',
    source: model.source,
    legendName: 'Published model (Koren 1996)',
    type,
    lines: measuredGrids(plan, points).map((vg1Volts) => ({
      vg1Volts,
      data: Array.from({ length: MODEL_SAMPLES }, (_, i): [number, number] => {
        const va = vaMin + ((vaMax - vaMin) * i) / (MODEL_SAMPLES - 1);
        return [va, ia(va, vg1Volts)];
      }),
    })),
  };
}

/** The drawing as chart overlays: dashed, muted lines sharing one legend entry. */
export function nominalOverlays(drawing: NominalDrawing, dark: boolean): ChartOverlay[] {
  const colour = dark ? 'rgba(203, 198, 190, 0.6)' : 'rgba(74, 70, 65, 0.55)';
  return drawing.lines.map((line) => ({
    id: `nominal-${line.vg1Volts}`,
    name: drawing.legendName,
    type: 'line',
    data: line.data,
    showSymbol: false,
    silent: true,
    animation: false,
    z: 3,
    emphasis: { disabled: true },
    lineStyle: { color: colour, width: 1.25, type: [6, 4] },
    itemStyle: { color: colour },
  }));
}

/** The reference operating point compared: published, nominal curve and measured Ia, mA. */
export interface ReferenceComparison {
  vaVolts: number;
  vg1Volts: number;
  vg2Volts: number | null;
  publishedMilliamps: number;
  nominalMilliamps: number | null;
  measuredMilliamps: number | null;
  source: string;
}

/** Ia at the type's reference point (its first operating point) from each side, where known. */
export function referenceComparison(
  drawing: NominalDrawing,
  plan: SweepPlan,
  points: readonly SweepPoint[],
): ReferenceComparison | null {
  const op = drawing.type.operatingPoints[0];
  if (!op) return null;
  const curve = plan.vg1Volts.findIndex((v) => Math.abs(v - op.vg1Volts) < SAME_GRID_VOLTS);
  const measured = points
    .filter((p) => p.curve === curve)
    .map((p): [number, number] => [p.vaVolts, p.iaMilliamps])
    .sort((a, b) => a[0] - b[0]);
  return {
    vaVolts: op.vaVolts,
    vg1Volts: op.vg1Volts,
    vg2Volts: op.vg2Volts,
    publishedMilliamps: op.iaMilliamps,
    nominalMilliamps: nominalIaAt(drawing, op.vaVolts, op.vg1Volts),
    measuredMilliamps: curve >= 0 ? interpolate(measured, op.vaVolts) : null,
    source: op.source,
  };
}

/** Ia on the drawing's curve of this grid voltage at Va, mA; null off the drawn curves. */
export function nominalIaAt(
  drawing: NominalDrawing,
  vaVolts: number,
  vg1Volts: number,
): number | null {
  const line = drawing.lines.find((l) => Math.abs(l.vg1Volts - vg1Volts) < SAME_GRID_VOLTS);
  return line ? interpolate(line.data, vaVolts) : null;
}

/** y at x on a line through [x, y] pairs sorted by x; null outside it. */
function interpolate(data: readonly [number, number][], x: number): number | null {
  for (let i = 1; i < data.length; i++) {
    const [x0, y0] = data[i - 1];
    const [x1, y1] = data[i];
    if (x >= x0 && x <= x1) return x1 === x0 ? y0 : y0 + ((y1 - y0) * (x - x0)) / (x1 - x0);
  }
  return null;
}
