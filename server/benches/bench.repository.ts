import type { Updateable } from 'kysely';
import type { BenchRow, BenchTable, HubDb, NewBenchRow } from '../db/database';

/** Every bench, by id. */
export function listBenchRows(db: HubDb): Promise<BenchRow[]> {
  return db.selectFrom('benches').selectAll().orderBy('id').execute();
}

/** The bench with this id, or undefined. */
export function findBenchRow(db: HubDb, id: number): Promise<BenchRow | undefined> {
  return db.selectFrom('benches').selectAll().where('id', '=', id).executeTakeFirst();
}

/** The bench with this name, or undefined. */
export function findBenchRowByName(db: HubDb, name: string): Promise<BenchRow | undefined> {
  return db.selectFrom('benches').selectAll().where('name', '=', name).executeTakeFirst();
}

/** Ids and token hashes of every bench, for token checks. */
export function listBenchTokenHashes(db: HubDb): Promise<{ id: number; token_hash: string }[]> {
  return db.selectFrom('benches').select(['id', 'token_hash']).execute();
}

/** Inserts a bench; returns its id. */
export async function insertBench(db: HubDb, row: NewBenchRow): Promise<number> {
  const r = await db.insertInto('benches').values(row).returning('id').executeTakeFirstOrThrow();
  return r.id;
}

/** Updates some columns of a bench. */
export async function updateBench(
  db: HubDb,
  id: number,
  changes: Updateable<BenchTable>,
): Promise<void> {
  await db.updateTable('benches').set(changes).where('id', '=', id).execute();
}

/** Number of benches. */
export async function countBenches(db: HubDb): Promise<number> {
  const r = await db
    .selectFrom('benches')
    .select((eb) => eb.fn.countAll<number>().as('n'))
    .executeTakeFirstOrThrow();
  return Number(r.n);
}
