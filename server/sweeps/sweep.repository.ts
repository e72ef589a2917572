import { sql, type Updateable } from 'kysely';
import type { SweepPoint, SweepStatus } from '../../shared/domain/sweep';
import type { HubDb, NewSweepRow, SweepPointRow, SweepRow, SweepTable } from '../db/database';

/** A sweep row with its operator's user name. */
export type SweepRecord = SweepRow & { operator: string };

/** Statuses of a sweep that has not ended. */
export const ACTIVE_STATUSES: readonly SweepStatus[] = ['pending', 'running'];

/**
 * Rows a single INSERT of points carries: 8 bound values a row, well under SQLite's limit of
 * 32,766 bound values a statement.
 */
export const POINT_ROWS_PER_INSERT = 2000;

function selectSweeps(db: HubDb) {
  return db
    .selectFrom('sweeps')
    .innerJoin('users', 'users.id', 'sweeps.operator_id')
    .selectAll('sweeps')
    .select('users.username as operator');
}

/** The sweep with this id, or undefined. */
export function findSweep(db: HubDb, id: number): Promise<SweepRecord | undefined> {
  return selectSweeps(db).where('sweeps.id', '=', id).executeTakeFirst();
}

/** The bench's unfinished sweep, or undefined. */
export function findActiveSweepOfBench(
  db: HubDb,
  benchId: number,
): Promise<SweepRecord | undefined> {
  return selectSweeps(db)
    .where('sweeps.bench_id', '=', benchId)
    .where('sweeps.status', 'in', ACTIVE_STATUSES)
    .executeTakeFirst();
}

/** Every unfinished sweep. */
export function listActiveSweeps(db: HubDb): Promise<SweepRecord[]> {
  return selectSweeps(db).where('sweeps.status', 'in', ACTIVE_STATUSES).execute();
}

/** Inserts a sweep; returns its id. */
export async function insertSweep(db: HubDb, row: NewSweepRow): Promise<number> {
  const r = await db.insertInto('sweeps').values(row).returning('id').executeTakeFirstOrThrow();
  return r.id;
}

/** Updates a sweep only while its status is one of `from`; returns whether it did. */
export async function updateSweepFrom(
  db: HubDb,
  id: number,
  from: readonly SweepStatus[],
  changes: Updateable<SweepTable>,
): Promise<boolean> {
  const r = await db
    .updateTable('sweeps')
    .set(changes)
    .where('id', '=', id)
    .where('status', 'in', from)
    .executeTakeFirst();
  return Number(r.numUpdatedRows) > 0;
}

/** Updates a sweep unconditionally. */
export async function updateSweep(
  db: HubDb,
  id: number,
  changes: Updateable<SweepTable>,
): Promise<void> {
  await db.updateTable('sweeps').set(changes).where('id', '=', id).execute();
}

/**
 * Inserts points that are not stored yet (same seq: kept as first stored) and adds the number
 * inserted to the sweep's point_count. Call inside a transaction. Returns the points inserted.
 */
export async function insertNewPoints(
  db: HubDb,
  sweepId: number,
  points: readonly SweepPoint[],
): Promise<SweepPoint[]> {
  const inserted: SweepPoint[] = [];
  for (let i = 0; i < points.length; i += POINT_ROWS_PER_INSERT) {
    const rows = points.slice(i, i + POINT_ROWS_PER_INSERT).map((p) => ({
      sweep_id: sweepId,
      seq: p.seq,
      curve: p.curve,
      va_volts: p.vaVolts,
      vg1_volts: p.vg1Volts,
      vg2_volts: p.vg2Volts,
      ia_milliamps: p.iaMilliamps,
      ig2_milliamps: p.ig2Milliamps,
    }));
    const r = await db
      .insertInto('sweep_points')
      .values(rows)
      .onConflict((oc) => oc.columns(['sweep_id', 'seq']).doNothing())
      .returningAll()
      .execute();
    inserted.push(...r.map(toPoint));
  }
  if (inserted.length > 0) {
    await db
      .updateTable('sweeps')
      .set((eb) => ({ point_count: eb('point_count', '+', inserted.length) }))
      .where('id', '=', sweepId)
      .execute();
  }
  return inserted.sort((a, b) => a.seq - b.seq);
}

/** Stored points of a sweep with seq >= fromSeq, in seq order. */
export async function listPoints(db: HubDb, sweepId: number, fromSeq = 0): Promise<SweepPoint[]> {
  const rows = await db
    .selectFrom('sweep_points')
    .selectAll()
    .where('sweep_id', '=', sweepId)
    .where('seq', '>=', fromSeq)
    .orderBy('seq')
    .execute();
  return rows.map(toPoint);
}

/** Stored seqs of a sweep, ascending. */
export async function listPointSeqs(db: HubDb, sweepId: number): Promise<number[]> {
  const rows = await db
    .selectFrom('sweep_points')
    .select('seq')
    .where('sweep_id', '=', sweepId)
    .orderBy('seq')
    .execute();
  return rows.map((r) => r.seq);
}

/** Every sweep of a valve record, newest first. */
export function listSweepsOfValve(db: HubDb, valveId: number): Promise<SweepRecord[]> {
  return selectSweeps(db)
    .where('sweeps.valve_id', '=', valveId)
    .orderBy('sweeps.created_at', 'desc')
    .orderBy('sweeps.id', 'desc')
    .execute();
}

/** Gives the sweeps of a valve record its new label, so that they are found by it. */
export async function relabelSweepsOfValve(
  db: HubDb,
  valveId: number,
  label: string,
): Promise<void> {
  await db
    .updateTable('sweeps')
    .set({ valve_label: label })
    .where('valve_id', '=', valveId)
    .execute();
}

/** Filter, sort and page of the sweep list. Sort columns are SQL names. */
export interface SweepListFilter {
  status?: SweepStatus;
  benchId?: number;
  valveId?: number;
  /** Substring of valve label or type. */
  search?: string;
  sortColumn: 'created_at' | 'status' | 'valve_type' | 'point_count';
  descending: boolean;
  limit: number;
  offset: number;
}

/** A page of sweeps and how many match in all. */
export async function listSweeps(
  db: HubDb,
  f: SweepListFilter,
): Promise<{ rows: SweepRecord[]; total: number }> {
  let q = selectSweeps(db);
  if (f.status) q = q.where('sweeps.status', '=', f.status);
  if (f.benchId) q = q.where('sweeps.bench_id', '=', f.benchId);
  if (f.valveId) q = q.where('sweeps.valve_id', '=', f.valveId);
  if (f.search) {
    const pattern = `%${f.search.replace(/[\\%_]/g, (c) => '\\' + c)}%`;
    q = q.where((eb) =>
      eb.or([
        sql<boolean>`${eb.ref('sweeps.valve_label')} like ${pattern} escape '\\'`,
        sql<boolean>`${eb.ref('sweeps.valve_type')} like ${pattern} escape '\\'`,
      ]),
    );
  }
  const direction = f.descending ? 'desc' : 'asc';
  const rows = await q
    .orderBy(`sweeps.${f.sortColumn}`, direction)
    .orderBy('sweeps.id', direction)
    .limit(f.limit)
    .offset(f.offset)
    .execute();
  const count = await q
    .clearSelect()
    .select((eb) => eb.fn.countAll<number>().as('n'))
    .executeTakeFirstOrThrow();
  return { rows, total: Number(count.n) };
}

function toPoint(r: SweepPointRow): SweepPoint {
  return {
    seq: r.seq,
    curve: r.curve,
    vaVolts: r.va_volts,
    vg1Volts: r.vg1_volts,
    vg2Volts: r.vg2_volts,
    iaMilliamps: r.ia_milliamps,
    ig2Milliamps: r.ig2_milliamps,
  };
}
