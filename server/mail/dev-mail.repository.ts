import type { Insertable } from 'kysely';
import type { HubDb } from '../db/database';
import type { OutboxReceivedTable } from './outbox-received.table';

/** Keeps a message the development mail server received. */
export async function insertReceived(db: HubDb, row: Insertable<OutboxReceivedTable>) {
  await db.insertInto('outbox_received').values(row).execute();
}

/** Received messages, newest first. */
export function listReceived(db: HubDb, limit: number) {
  return db.selectFrom('outbox_received').selectAll().orderBy('id', 'desc').limit(limit).execute();
}

/** One received message, or undefined. */
export function findReceived(db: HubDb, id: number) {
  return db.selectFrom('outbox_received').selectAll().where('id', '=', id).executeTakeFirst();
}
