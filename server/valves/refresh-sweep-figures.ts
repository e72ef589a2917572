import type { SweepPlan } from '../../shared/domain/sweep';
import type { HubDb } from '../db/database';
import { ACTIVE_STATUSES, listPoints } from '../sweeps/sweep.repository';
import { findTypeRecordById } from '../valve-types/valve-type.repository';
import { toValveTypeView } from '../valve-types/valve-type-view';
import { computeSweepFigures } from './sweep-figures';
import { listFigures, upsertFigures, type SweepFiguresRow } from './sweep-figures.repository';

/**
 * Brings the stored figures of a sweep up to date: computed for a sweep that has ended and is
 * on a valve record, at the reference point of the valve's type. Figures already computed from
 * the same points at the same reference point are kept (and those from before the analysis
 * carried cut curves on, extended_volts null, are computed again). Returns the row, or null when the
 * sweep has no figures (still running, or on no record).
 */
export async function refreshSweepFigures(
  db: HubDb,
  sweepId: number,
): Promise<SweepFiguresRow | null> {
  const sweep = await db
    .selectFrom('sweeps')
    .innerJoin('valves', 'valves.id', 'sweeps.valve_id')
    .select(['sweeps.status', 'sweeps.point_count', 'sweeps.plan_json', 'valves.valve_type_id'])
    .where('sweeps.id', '=', sweepId)
    .executeTakeFirst();
  if (!sweep || ACTIVE_STATUSES.includes(sweep.status)) return null;
  const record = await findTypeRecordById(db, sweep.valve_type_id);
  if (!record) return null;
  const reference = toValveTypeView(record).operatingPoints[0];
  const [stored] = await listFigures(db, [sweepId]);
  if (
    stored &&
    stored.extended_volts !== null &&
    stored.point_count === sweep.point_count &&
    stored.va_volts === reference.vaVolts &&
    stored.vg1_volts === reference.vg1Volts &&
    stored.vg2_volts === reference.vg2Volts &&
    stored.nominal_ia_milliamps === reference.iaMilliamps &&
    stored.nominal_gm_microsiemens === reference.gmMicrosiemens
  ) {
    return stored;
  }
  const plan = JSON.parse(sweep.plan_json) as SweepPlan;
  const points = await listPoints(db, sweepId);
  const figures = computeSweepFigures(plan, points, reference);
  await upsertFigures(db, sweepId, sweep.point_count, figures);
  const [row] = await listFigures(db, [sweepId]);
  return row ?? null;
}

/** Recomputes the figures of every ended sweep on a record of this type. */
export async function refreshFiguresOfType(db: HubDb, typeId: number): Promise<void> {
  const rows = await db
    .selectFrom('sweeps')
    .innerJoin('valves', 'valves.id', 'sweeps.valve_id')
    .select('sweeps.id')
    .where('valves.valve_type_id', '=', typeId)
    .execute();
  for (const r of rows) await refreshSweepFigures(db, r.id);
}
