import type { HubDb, NewUserRow, UserRow } from '../db/database';

/** The user with this sign-in name, or undefined. */
export function findUserByUsername(db: HubDb, username: string): Promise<UserRow | undefined> {
  return db.selectFrom('users').selectAll().where('username', '=', username).executeTakeFirst();
}

/** The user with this id, or undefined. */
export function findUserById(db: HubDb, id: number): Promise<UserRow | undefined> {
  return db.selectFrom('users').selectAll().where('id', '=', id).executeTakeFirst();
}

/** Inserts a user; returns its id. */
export async function insertUser(db: HubDb, row: NewUserRow): Promise<number> {
  const r = await db.insertInto('users').values(row).returning('id').executeTakeFirstOrThrow();
  return r.id;
}

/** Number of users. */
export async function countUsers(db: HubDb): Promise<number> {
  const r = await db
    .selectFrom('users')
    .select((eb) => eb.fn.countAll<number>().as('n'))
    .executeTakeFirstOrThrow();
  return Number(r.n);
}
