import type { Selectable } from 'kysely';
import type { HubDb } from '../db/database';
import type { SweepFigures } from './sweep-figures';
import type { SweepFiguresTable } from './valve.table';

/** A stored figures row. */
export type SweepFiguresRow = Selectable<SweepFiguresTable>;

/** Stored figures of these sweeps. */
export function listFigures(db: HubDb, sweepIds: readonly number[]): Promise<SweepFiguresRow[]> {
  if (sweepIds.length === 0) return Promise.resolve([]);
  return db.selectFrom('sweep_figures').selectAll().where('sweep_id', 'in', sweepIds).execute();
}

/** Stores (or replaces) a sweep's figures, computed from `pointCount` points. */
export async function upsertFigures(
  db: HubDb,
  sweepId: number,
  pointCount: number,
  f: SweepFigures,
): Promise<void> {
  const row = {
    point_count: pointCount,
    va_volts: f.vaVolts,
    vg1_volts: f.vg1Volts,
    vg2_volts: f.vg2Volts,
    nominal_ia_milliamps: f.nominalIaMilliamps,
    nominal_gm_microsiemens: f.nominalGmMicrosiemens,
    ia_milliamps: f.iaMilliamps,
    gm_microsiemens: f.gmMicrosiemens,
    ra_kiloohms: f.raKiloohms,
    mu: f.mu,
    ia_percent: f.iaPercent,
    gm_percent: f.gmPercent,
    refusal: f.refusal,
    extended_volts: f.extendedVolts,
    computed_at: new Date().toISOString(),
  };
  await db
    .insertInto('sweep_figures')
    .values({ sweep_id: sweepId, ...row })
    .onConflict((oc) => oc.column('sweep_id').doUpdateSet(row))
    .execute();
}
