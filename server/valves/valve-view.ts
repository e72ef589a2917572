import type { z } from 'zod';
import type { SweepFiguresRow } from './sweep-figures.repository';
import type { ValveRecord } from './valve.repository';
import type { sweepFiguresSchema, valveViewSchema } from './valve.schemas';

/** A valve record as the API lists it. */
export type ValveView = z.output<typeof valveViewSchema>;

/** A sweep's figures as the API shows them. */
export type SweepFiguresView = z.output<typeof sweepFiguresSchema>;

/** Four significant figures: more than any tracer resolves, fewer than float noise. */
function sig(x: number | null): number | null {
  return x === null ? null : Number(x.toPrecision(4));
}

/** Maps a valve row (snake_case) to the API shape (camelCase). */
export function toValveView(r: ValveRecord): ValveView {
  return {
    id: r.id,
    label: r.label,
    type: r.type_designation,
    maker: r.maker,
    dateCode: r.date_code,
    originKind: r.origin_kind,
    originText: r.origin_text,
    location: r.location,
    status: r.status,
    notes: r.notes,
    grade: r.grade === 'ungraded' ? null : r.grade,
    percentOfNominal: sig(r.grade_percent),
    gradeSource: r.grade_source,
    gradedAt: r.graded_at,
    sweepCount: Number(r.sweep_count),
    lastSweepAt: r.last_sweep_at,
    createdBy: r.created_by_name,
    updatedBy: r.updated_by_name,
    createdAt: r.created_at,
    updatedAt: r.updated_at,
  };
}

/** Maps a figures row, with its sweep's time, to the API shape. */
export function toFiguresView(f: SweepFiguresRow, at: string): SweepFiguresView {
  return {
    sweepId: f.sweep_id,
    at,
    vaVolts: f.va_volts,
    vg1Volts: f.vg1_volts,
    iaMilliamps: sig(f.ia_milliamps),
    gmMicrosiemens: sig(f.gm_microsiemens),
    raKiloohms: sig(f.ra_kiloohms),
    mu: sig(f.mu),
    iaPercent: sig(f.ia_percent),
    gmPercent: sig(f.gm_percent),
    refusal: f.refusal,
    extendedVolts: f.extended_volts ?? 0,
  };
}
