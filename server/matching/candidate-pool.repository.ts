import { sql } from 'kysely';
import type { HubDb } from '../db/database';
import type { ValveStatus } from '../valves/valve-status';

/** A valve with its newest complete anode-family sweep: what a matching run starts from. */
export interface PoolValveRow {
  valve_id: number;
  label: string;
  status: ValveStatus;
  type_designation: string;
  sweep_id: number;
  sweep_at: string;
  bench_id: number;
  bench_name: string;
  plan_json: string;
  /** Newest complete anode-family sweep of section 2 (double triodes), or null. */
  section2_sweep_id: number | null;
}

/** Which valves a run considers; dates bound the sweep's start (ISO 8601). */
export interface PoolFilter {
  /** Valve type id. */
  typeId: number;
  statuses: readonly ValveStatus[];
  /** Restrict to these valve ids. */
  valveIds?: readonly number[];
  dateFrom?: string;
  dateTo?: string;
}

/**
 * Valves of a type with the newest complete anode-family sweep of section 1 each (within the
 * dates), and that of section 2 where there is one; valves without the first are not returned.
 */
export async function listPoolValves(db: HubDb, f: PoolFilter): Promise<PoolValveRow[]> {
  let inner = db
    .selectFrom('valves as v')
    .innerJoin('valve_types as t', 't.id', 'v.valve_type_id')
    .select(['v.id as valve_id', 'v.label', 'v.status', 't.designation as type_designation'])
    .select((eb) => {
      const newest = (section: 1 | 2) => {
        let s = eb
          .selectFrom('sweeps as s')
          .select('s.id')
          .whereRef('s.valve_id', '=', 'v.id')
          .where('s.status', '=', 'complete')
          .where(sql<boolean>`json_extract(s.plan_json, '$.kind') = 'anode'`)
          .where(sql<boolean>`coalesce(json_extract(s.plan_json, '$.section'), 1) = ${section}`);
        if (f.dateFrom) s = s.where('s.created_at', '>=', f.dateFrom);
        if (f.dateTo) s = s.where('s.created_at', '<=', f.dateTo);
        return s.orderBy('s.created_at', 'desc').orderBy('s.id', 'desc').limit(1);
      };
      return [newest(1).as('sweep_id'), newest(2).as('section2_sweep_id')];
    })
    .where('v.valve_type_id', '=', f.typeId);
  if (f.statuses.length) inner = inner.where('v.status', 'in', [...f.statuses]);
  if (f.valveIds) inner = inner.where('v.id', 'in', f.valveIds.length ? [...f.valveIds] : [-1]);
  const rows = await db
    .selectFrom(inner.as('x'))
    .innerJoin('sweeps as ls', 'ls.id', 'x.sweep_id')
    .innerJoin('benches as b', 'b.id', 'ls.bench_id')
    .select([
      'x.valve_id',
      'x.label',
      'x.status',
      'x.type_designation',
      'ls.id as sweep_id',
      'ls.created_at as sweep_at',
      'ls.bench_id',
      'b.name as bench_name',
      'ls.plan_json',
      'x.section2_sweep_id',
    ])
    .orderBy('x.valve_id')
    .execute();
  return rows as PoolValveRow[];
}

/** The id of a valve type by designation (any case), or undefined. */
export async function findTypeId(db: HubDb, designation: string): Promise<number | undefined> {
  const row = await db
    .selectFrom('valve_types')
    .select('id')
    .where(sql<boolean>`designation = ${designation} collate nocase`)
    .executeTakeFirst();
  return row?.id;
}
