import { sql, type Insertable, type Selectable, type Updateable } from 'kysely';
import { HARD_FAILS, type HardFail } from '../../shared/grading/grade-quick-test';
import type { GradeThresholds, ValveGrade } from '../../shared/grading/grade-thresholds';
import type { HubDb } from '../db/database';
import type { ValveStatus } from './valve-status';
import type { ValveTable } from './valve.table';

/** A valve row with its type's designation, its people, its sweeps and its grade. */
export type ValveRecord = Selectable<ValveTable> & {
  type_designation: string;
  created_by_name: string | null;
  updated_by_name: string | null;
  sweep_count: number;
  last_sweep_at: string | null;
  /**
   * The graded figure as % of nominal (gradedPercent: gm, else Ia) from the newest sweep with
   * figures or completed quick test; null if none.
   */
  grade_percent: number | null;
  /** What the grade was taken from, and when. */
  grade_source: 'sweep' | 'quick-test' | null;
  graded_at: string | null;
  grade: ValveGrade | HardFail | 'ungraded';
};

/**
 * Valves with everything the list shows, as a subquery so that grade can be sorted and
 * filtered on like any column. The grade is computed here, with the thresholds in force.
 */
function valvesWithGrade(db: HubDb, t: GradeThresholds) {
  const inner = db
    .selectFrom('valves as v')
    .innerJoin('valve_types as t', 't.id', 'v.valve_type_id')
    .leftJoin('users as cu', 'cu.id', 'v.created_by')
    .leftJoin('users as uu', 'uu.id', 'v.updated_by')
    .selectAll('v')
    .select([
      't.designation as type_designation',
      'cu.username as created_by_name',
      'uu.username as updated_by_name',
    ])
    .select((eb) => [
      eb
        .selectFrom('sweeps as s')
        .select((sb) => sb.fn.countAll<number>().as('n'))
        .whereRef('s.valve_id', '=', 'v.id')
        .as('sweep_count'),
      eb
        .selectFrom('sweeps as s')
        .select((sb) => sb.fn.max('s.created_at').as('m'))
        .whereRef('s.valve_id', '=', 'v.id')
        .as('last_sweep_at'),
      newestGradedMeasurement().as('graded'),
    ]);
  const percent = sql<number | null>`json_extract(x.graded, '$.p')`;
  const fail = sql<string | null>`json_extract(x.graded, '$.fail')`;
  return db
    .selectFrom(inner.as('x'))
    .selectAll('x')
    .select([
      percent.as('grade_percent'),
      sql<ValveRecord['grade_source']>`json_extract(x.graded, '$.source')`.as('grade_source'),
      sql<string | null>`json_extract(x.graded, '$.at')`.as('graded_at'),
      sql<ValveRecord['grade']>`case
        when ${fail} is not null then ${fail}
        when ${percent} is null then 'ungraded'
        when ${percent} >= ${t.strongMinPercent} then 'strong'
        when ${percent} >= ${t.fairMinPercent} then 'fair'
        else 'weak' end`.as('grade'),
    ]);
}

/**
 * The valve's newest graded measurement as JSON text {p, fail, source, at}: a section-1 sweep
 * (section 2 of a double triode is matching's concern, as section balance) with figures at the
 * reference point (p = gradedPercent of its gm and Ia) or a completed quick test
 * (p = its graded figure; fail = its hard fail, if any). A correlated subquery on `v`.
 */
function newestGradedMeasurement() {
  const hardFails = sql.join(HARD_FAILS.map((f) => sql.lit(f)));
  return sql<string | null>`(select json_object('p', m.p, 'fail', m.fail, 'source', m.source,
      'at', m.at)
    from (
      select s.created_at as at, s.id as k, 'sweep' as source,
        coalesce(f.gm_percent, f.ia_percent) as p, null as fail
      from sweep_figures f join sweeps s on s.id = f.sweep_id
      where s.valve_id = v.id and f.refusal is null
        and coalesce(json_extract(s.plan_json, '$.section'), 1) = 1
      union all
      select coalesce(q.ended_at, q.created_at), q.id, 'quick-test', q.grade_percent,
        case when q.grade in (${hardFails}) then q.grade end
      from quick_tests q
      where q.valve_id = v.id and q.status = 'complete' and q.grade is not null
        and q.grade != 'incomplete'
    ) m
    order by m.at desc, m.source desc, m.k desc
    limit 1)`;
}

/** Filter, sort and page of the valve list (sort columns are SQL names). */
export interface ValveListFilter {
  typeId?: number;
  status?: ValveStatus;
  grade?: ValveRecord['grade'];
  location?: string;
  /** Substring of label, maker or notes. */
  search?: string;
  sortColumn: 'label' | 'type_designation' | 'status' | 'location' | 'updated_at' | 'grade_percent';
  descending: boolean;
  limit: number;
  offset: number;
}

/** A sort column of the valve list. */
export type ValveFilterSort = ValveListFilter['sortColumn'];

/** A page of valves and how many match in all. */
export async function listValves(
  db: HubDb,
  thresholds: GradeThresholds,
  f: ValveListFilter,
): Promise<{ rows: ValveRecord[]; total: number }> {
  let q = db.selectFrom(valvesWithGrade(db, thresholds).as('g'));
  if (f.typeId !== undefined) q = q.where('g.valve_type_id', '=', f.typeId);
  if (f.status) q = q.where('g.status', '=', f.status);
  if (f.grade) q = q.where('g.grade', '=', f.grade);
  if (f.location)
    q = q.where(sql<boolean>`${sql.ref('g.location')} = ${f.location} collate nocase`);
  if (f.search) {
    const pattern = `%${f.search.replace(/[\\%_]/g, (c) => '\\' + c)}%`;
    q = q.where((eb) =>
      eb.or(
        (['g.label', 'g.maker', 'g.notes'] as const).map(
          (c) => sql<boolean>`${eb.ref(c)} like ${pattern} escape '\\'`,
        ),
      ),
    );
  }
  const direction = f.descending ? 'desc' : 'asc';
  // Valves without a figure (null) go last whichever way the list is sorted.
  const rows = (await q
    .selectAll('g')
    .orderBy(sql`${sql.ref(`g.${f.sortColumn}`)} is null`)
    .orderBy(sql`${sql.ref(`g.${f.sortColumn}`)} collate nocase`, direction)
    .orderBy('g.label', direction)
    .limit(f.limit)
    .offset(f.offset)
    .execute()) as ValveRecord[];
  const count = await q.select((eb) => eb.fn.countAll<number>().as('n')).executeTakeFirstOrThrow();
  return { rows, total: Number(count.n) };
}

/** Every valve, by label (export). */
export async function listAllValves(db: HubDb, t: GradeThresholds): Promise<ValveRecord[]> {
  const rows = await db
    .selectFrom(valvesWithGrade(db, t).as('g'))
    .selectAll('g')
    .orderBy(sql`g.label collate nocase`)
    .execute();
  return rows as ValveRecord[];
}

/** The valve with this id, or undefined. */
export async function findValve(
  db: HubDb,
  t: GradeThresholds,
  id: number,
): Promise<ValveRecord | undefined> {
  const row = await db
    .selectFrom(valvesWithGrade(db, t).as('g'))
    .selectAll('g')
    .where('g.id', '=', id)
    .executeTakeFirst();
  return row as ValveRecord | undefined;
}

/** The bare valve row, or undefined. */
export function findValveRow(db: HubDb, id: number) {
  return db.selectFrom('valves').selectAll().where('id', '=', id).executeTakeFirst();
}

/** Whether a label is in use (any case), other than by `exceptId`. */
export async function labelTaken(db: HubDb, label: string, exceptId?: number): Promise<boolean> {
  let q = db.selectFrom('valves').select('id').where('label', '=', label);
  if (exceptId !== undefined) q = q.where('id', '!=', exceptId);
  return (await q.executeTakeFirst()) !== undefined;
}

/** Inserts a valve; returns its id. */
export async function insertValve(db: HubDb, row: Insertable<ValveTable>): Promise<number> {
  const r = await db.insertInto('valves').values(row).returning('id').executeTakeFirstOrThrow();
  return r.id;
}

/** Updates a valve. */
export async function updateValve(
  db: HubDb,
  id: number,
  changes: Updateable<ValveTable>,
): Promise<void> {
  await db.updateTable('valves').set(changes).where('id', '=', id).execute();
}

/** Deletes a valve; its sweeps stay, detached; its attachment rows go with it. */
export async function deleteValve(db: HubDb, id: number): Promise<void> {
  await db.deleteFrom('valves').where('id', '=', id).execute();
}
