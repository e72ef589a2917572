import path from 'node:path';
import { sql } from 'kysely';
import type { HubDb } from '../db/database';

/**
 * The uploads directory: `uploads` beside the database file, which is DATA_DIR/uploads with
 * the default DB_FILE. Photos and the rows that name them then move, and are backed up,
 * together. Resolved from the open database, so the app needs no extra configuration.
 */
export async function uploadsDirOf(db: HubDb): Promise<string> {
  const r = await sql<{ name: string; file: string }>`pragma database_list`.execute(db);
  const main = r.rows.find((row) => row.name === 'main');
  if (!main?.file) throw new Error('the database has no file, so uploads have no home');
  return path.join(path.dirname(main.file), 'uploads');
}
