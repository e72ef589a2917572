import { type Updateable } from 'kysely';
import type { QuickTestStatus } from '../../shared/hub/messages';
import type { HubDb } from '../db/database';
import type { NewQuickTestRow, QuickTestRow, QuickTestTable } from './quick-test.table';

/** A quick-test row with its operator's user name. */
export type QuickTestRecord = QuickTestRow & { operator: string };

/** Statuses of a quick test that has not ended. */
export const ACTIVE_QUICK_TEST_STATUSES: readonly QuickTestStatus[] = ['pending', 'running'];

function selectQuickTests(db: HubDb) {
  return db
    .selectFrom('quick_tests')
    .innerJoin('users', 'users.id', 'quick_tests.operator_id')
    .selectAll('quick_tests')
    .select('users.username as operator');
}

/** The quick test with this id, or undefined. */
export function findQuickTest(db: HubDb, id: number): Promise<QuickTestRecord | undefined> {
  return selectQuickTests(db).where('quick_tests.id', '=', id).executeTakeFirst();
}

/** The bench's unfinished quick test, or undefined. */
export function findActiveQuickTestOfBench(
  db: HubDb,
  benchId: number,
): Promise<QuickTestRecord | undefined> {
  return selectQuickTests(db)
    .where('quick_tests.bench_id', '=', benchId)
    .where('quick_tests.status', 'in', ACTIVE_QUICK_TEST_STATUSES)
    .executeTakeFirst();
}

/** Every unfinished quick test. */
export function listActiveQuickTests(db: HubDb): Promise<QuickTestRecord[]> {
  return selectQuickTests(db)
    .where('quick_tests.status', 'in', ACTIVE_QUICK_TEST_STATUSES)
    .execute();
}

/** Inserts a quick test; returns its id. */
export async function insertQuickTest(db: HubDb, row: NewQuickTestRow): Promise<number> {
  const r = await db
    .insertInto('quick_tests')
    .values(row)
    .returning('id')
    .executeTakeFirstOrThrow();
  return r.id;
}

/** Updates a quick test only while its status is one of `from`; returns whether it did. */
export async function updateQuickTestFrom(
  db: HubDb,
  id: number,
  from: readonly QuickTestStatus[],
  changes: Updateable<QuickTestTable>,
): Promise<boolean> {
  const r = await db
    .updateTable('quick_tests')
    .set(changes)
    .where('id', '=', id)
    .where('status', 'in', from)
    .executeTakeFirst();
  return Number(r.numUpdatedRows) > 0;
}

/** Filter, sort and page of the quick-test list. */
export interface QuickTestListFilter {
  valveId?: number;
  benchId?: number;
  status?: QuickTestStatus;
  grade?: string;
  valveType?: string;
  descending: boolean;
  limit: number;
  offset: number;
}

/** A page of quick tests, newest first unless asked otherwise, and how many match in all. */
export async function listQuickTests(
  db: HubDb,
  f: QuickTestListFilter,
): Promise<{ rows: QuickTestRecord[]; total: number }> {
  let q = selectQuickTests(db);
  if (f.valveId !== undefined) q = q.where('quick_tests.valve_id', '=', f.valveId);
  if (f.benchId !== undefined) q = q.where('quick_tests.bench_id', '=', f.benchId);
  if (f.status) q = q.where('quick_tests.status', '=', f.status);
  if (f.grade) q = q.where('quick_tests.grade', '=', f.grade);
  if (f.valveType) q = q.where('quick_tests.valve_type', '=', f.valveType);
  const direction = f.descending ? 'desc' : 'asc';
  const rows = await q
    .orderBy('quick_tests.created_at', direction)
    .orderBy('quick_tests.id', direction)
    .limit(f.limit)
    .offset(f.offset)
    .execute();
  const count = await q
    .clearSelect()
    .select((eb) => eb.fn.countAll<number>().as('n'))
    .executeTakeFirstOrThrow();
  return { rows, total: Number(count.n) };
}
