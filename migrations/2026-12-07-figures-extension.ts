import type { Kysely } from 'kysely';

/**
 * Keeps, with a sweep's figures, how far a curve next to the reference point was carried past
 * its last reading to reach it (V; 0 when none was). Null marks figures computed before the
 * analysis could carry cut curves on: they are computed again when next needed.
 */
// eslint-disable-next-line @typescript-eslint/no-explicit-any -- frozen in time: no typed schema
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable('sweep_figures').addColumn('extended_volts', 'real').execute();
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- frozen in time: no typed schema
export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable('sweep_figures').dropColumn('extended_volts').execute();
}
