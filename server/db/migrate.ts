import { Migrator, type Migration, type MigrationProvider, type MigrationResultSet } from 'kysely';
import * as initial from '../../migrations/2026-12-01-initial';
import * as matchSets from '../../migrations/2026-12-05-match-sets';
import * as quickTests from '../../migrations/2026-12-04-quick-tests';
import * as quickTestPercent from '../../migrations/2026-12-06-quick-test-percent';
import * as figuresExtension from '../../migrations/2026-12-07-figures-extension';
import * as typeLibrary from '../../migrations/2026-12-02-type-library';
import * as valveRecords from '../../migrations/2026-12-03-valve-records';
import { loadConfig } from '../config';
import { isEntryPoint } from '../is-entry-point';
import { typeLibrarySeed } from '../valve-types/seed-type-library';
import { openDatabase, type HubDb } from './database';

/** Every migration by name; names sort in the order they run. Static, so tsx and Vitest agree. */
const MIGRATIONS: Record<string, Migration> = {
  '2026-12-01-initial': initial,
  '2026-12-02-type-library': typeLibrary,
  // Data, not schema: fills the new library once from shared/catalog (lives with its feature).
  '2026-12-02-type-library-seed': typeLibrarySeed,
  '2026-12-03-valve-records': valveRecords,
  '2026-12-04-quick-tests': quickTests,
  '2026-12-05-match-sets': matchSets,
  '2026-12-06-quick-test-percent': quickTestPercent,
  '2026-12-07-figures-extension': figuresExtension,
};

const provider: MigrationProvider = { getMigrations: async () => MIGRATIONS };

/**
 * Runs every pending migration, or those up to and including `upTo` (tests of a data
 * migration start from the schema before it); throws (after logging what ran) if one fails.
 */
export async function migrateToLatest(db: HubDb, upTo?: string): Promise<MigrationResultSet> {
  const migrator = new Migrator({ db, provider });
  const result = upTo ? await migrator.migrateTo(upTo) : await migrator.migrateToLatest();
  if (result.error) {
    const failed = result.results?.find((r) => r.status === 'Error')?.migrationName ?? 'unknown';
    throw new Error(`migration ${failed} failed: ${String(result.error)}`, {
      cause: result.error,
    });
  }
  return result;
}

if (isEntryPoint(import.meta.url)) {
  const config = loadConfig();
  const db = openDatabase(config.databaseFile);
  migrateToLatest(db)
    .then(async (result) => {
      for (const r of result.results ?? []) console.log(`${r.status}: ${r.migrationName}`);
      if (!result.results?.length) console.log('database is up to date');
      await db.destroy();
    })
    .catch(async (error: unknown) => {
      console.error(error instanceof Error ? error.message : error);
      await db.destroy();
      process.exitCode = 1;
    });
}
