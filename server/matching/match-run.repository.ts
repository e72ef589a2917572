import type { Insertable } from 'kysely';
import type { HubDb } from '../db/database';
import type { MatchRunTable } from './match-set.table';

/** Inserts a run; returns its id. */
export async function insertMatchRun(db: HubDb, row: Insertable<MatchRunTable>): Promise<number> {
  const r = await db.insertInto('match_runs').values(row).returning('id').executeTakeFirstOrThrow();
  return r.id;
}

/** A run with the name of who ran it, or undefined. */
export function findMatchRun(db: HubDb, id: number) {
  return db
    .selectFrom('match_runs as r')
    .leftJoin('users as u', 'u.id', 'r.created_by')
    .selectAll('r')
    .select('u.username as created_by_name')
    .where('r.id', '=', id)
    .executeTakeFirst();
}
