import type { Insertable, Selectable } from 'kysely';
import type { HubDb } from '../db/database';
import type { AttachmentTable } from './attachment.table';

/** An attachment row with its uploader's user name. */
export type AttachmentRecord = Selectable<AttachmentTable> & { uploader: string | null };

function selectAttachments(db: HubDb) {
  return db
    .selectFrom('attachments')
    .leftJoin('users', 'users.id', 'attachments.created_by')
    .selectAll('attachments')
    .select('users.username as uploader');
}

/** Inserts an attachment; returns its id. */
export async function insertAttachment(
  db: HubDb,
  row: Insertable<AttachmentTable>,
): Promise<number> {
  const r = await db
    .insertInto('attachments')
    .values(row)
    .returning('id')
    .executeTakeFirstOrThrow();
  return r.id;
}

/** The attachment with this id, or undefined. */
export function findAttachment(db: HubDb, id: number): Promise<AttachmentRecord | undefined> {
  return selectAttachments(db).where('attachments.id', '=', id).executeTakeFirst();
}

/** A valve's attachments, oldest first. */
export function listAttachmentsOfValve(db: HubDb, valveId: number): Promise<AttachmentRecord[]> {
  return selectAttachments(db)
    .where('attachments.valve_id', '=', valveId)
    .orderBy('attachments.id')
    .execute();
}

/** Deletes one attachment row. */
export async function deleteAttachment(db: HubDb, id: number): Promise<void> {
  await db.deleteFrom('attachments').where('id', '=', id).execute();
}
