import type { Insertable } from 'kysely';
import type { HubDb } from '../db/database';
import type {
  MatchSetMailingTable,
  MatchSetShareTable,
  MatchSetStatus,
  MatchSetTable,
} from './match-set.table';

/** A set row with the name of who made it. */
export function findMatchSet(db: HubDb, id: number) {
  return db
    .selectFrom('match_sets as m')
    .leftJoin('users as u', 'u.id', 'm.created_by')
    .selectAll('m')
    .select('u.username as created_by_name')
    .where('m.id', '=', id)
    .executeTakeFirst();
}

/** A page of sets, newest first. */
export async function listMatchSets(
  db: HubDb,
  f: { status?: MatchSetStatus; limit: number; offset: number },
) {
  let q = db.selectFrom('match_sets as m');
  if (f.status) q = q.where('m.status', '=', f.status);
  const rows = await q
    .leftJoin('users as u', 'u.id', 'm.created_by')
    .selectAll('m')
    .select('u.username as created_by_name')
    .orderBy('m.created_at', 'desc')
    .orderBy('m.id', 'desc')
    .limit(f.limit)
    .offset(f.offset)
    .execute();
  const count = await q.select((eb) => eb.fn.countAll<number>().as('n')).executeTakeFirstOrThrow();
  return { rows, total: Number(count.n) };
}

/** Members of sets with their labels, in position order. */
export function listMembers(db: HubDb, setIds: readonly number[]) {
  return db
    .selectFrom('match_set_members as mm')
    .innerJoin('valves as v', 'v.id', 'mm.valve_id')
    .innerJoin('valve_types as t', 't.id', 'v.valve_type_id')
    .leftJoin('sweeps as s', 's.id', 'mm.sweep_id')
    .leftJoin('benches as b', 'b.id', 's.bench_id')
    .select([
      'mm.match_set_id',
      'mm.position',
      'mm.valve_id',
      'mm.sweep_id',
      'v.label',
      'v.status',
      't.designation as type_designation',
      's.plan_json',
      's.created_at as swept_at',
      'b.name as bench_name',
    ])
    .where('mm.match_set_id', 'in', setIds.length ? [...setIds] : [-1])
    .orderBy('mm.match_set_id')
    .orderBy('mm.position')
    .execute();
}

/** Inserts a set with its members; gives it its code; returns its id. */
export async function insertMatchSet(
  db: HubDb,
  row: Insertable<MatchSetTable>,
  members: readonly { valveId: number; sweepId: number | null }[],
  codeOf: (id: number) => string,
): Promise<number> {
  const { id } = await db
    .insertInto('match_sets')
    .values(row)
    .returning('id')
    .executeTakeFirstOrThrow();
  await db
    .updateTable('match_sets')
    .set({ code: codeOf(id) })
    .where('id', '=', id)
    .execute();
  await db
    .insertInto('match_set_members')
    .values(
      members.map((m, position) => ({
        match_set_id: id,
        position,
        valve_id: m.valveId,
        sweep_id: m.sweepId,
      })),
    )
    .execute();
  return id;
}

/** Changes a set's status. */
export async function setMatchSetStatus(
  db: HubDb,
  id: number,
  status: MatchSetStatus,
  at: string,
): Promise<void> {
  await db.updateTable('match_sets').set({ status, updated_at: at }).where('id', '=', id).execute();
}

/** Records a mailing. */
export async function insertMailing(
  db: HubDb,
  row: Insertable<MatchSetMailingTable>,
): Promise<void> {
  await db.insertInto('match_set_mailings').values(row).execute();
}

/** Mailings of a set, oldest first. */
export function listMailings(db: HubDb, setId: number) {
  return db
    .selectFrom('match_set_mailings as ml')
    .leftJoin('users as u', 'u.id', 'ml.sent_by')
    .selectAll('ml')
    .select('u.username as sent_by_name')
    .where('ml.match_set_id', '=', setId)
    .orderBy('ml.id')
    .execute();
}

/** Inserts a share; returns its id. */
export async function insertShare(db: HubDb, row: Insertable<MatchSetShareTable>) {
  const r = await db
    .insertInto('match_set_shares')
    .values(row)
    .returning('id')
    .executeTakeFirstOrThrow();
  return r.id;
}

/** Shares of a set, oldest first. */
export function listShares(db: HubDb, setId: number) {
  return db
    .selectFrom('match_set_shares')
    .selectAll()
    .where('match_set_id', '=', setId)
    .orderBy('id')
    .execute();
}

/** The share with this token hash, or undefined. */
export function findShareByHash(db: HubDb, tokenHash: string) {
  return db
    .selectFrom('match_set_shares')
    .selectAll()
    .where('token_hash', '=', tokenHash)
    .executeTakeFirst();
}

/** Marks a share revoked; returns whether it was one of this set's live shares. */
export async function revokeShare(db: HubDb, setId: number, shareId: number, at: string) {
  const r = await db
    .updateTable('match_set_shares')
    .set({ revoked_at: at })
    .where('id', '=', shareId)
    .where('match_set_id', '=', setId)
    .where('revoked_at', 'is', null)
    .executeTakeFirst();
  return Number(r.numUpdatedRows) > 0;
}
