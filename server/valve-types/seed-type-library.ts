import type { Kysely, Migration } from 'kysely';
import { VALVE_TYPES, type ValveTypeData } from '../../shared/catalog/valve-types';
import type { Database, HubDb } from '../db/database';
import { validate } from '../http/validate';
import { countTypes, insertType } from './valve-type.repository';
import { valveTypeInput, type ValveTypeInput } from './valve-type.schemas';

/**
 * Splits a citation as the catalog writes it, "source; confidence" (e.g. "RCA data sheet;
 * high"), into its two parts. A citation without "; " is all source.
 */
export function splitCitation(cited: string): { source: string; confidence: string | null } {
  const at = cited.indexOf('; ');
  return at < 0
    ? { source: cited, confidence: null }
    : { source: cited.slice(0, at), confidence: cited.slice(at + 2) };
}

/** A catalog entry as library input, checked by the same schema as an admin's entry. */
export function catalogEntryInput(t: ValveTypeData): ValveTypeInput {
  return validate(
    valveTypeInput,
    {
      designation: t.designation,
      equivalents: t.equivalents,
      valveClass: t.valveClass,
      base: t.base,
      sections: t.sections,
      heaterVolts: t.heaterVolts,
      heaterAmps: t.heaterAmps,
      operatingPoints: t.operatingPoints.map((op) => ({ ...op, ...splitCitation(op.source) })),
      ratings: { ...t.ratings, ikMaxMilliamps: null, ...splitCitation(t.ratings.source) },
      model: t.model,
      notes: null,
    },
    'body',
  );
}

/**
 * Fills an empty type library from the catalog of published figures (shared/catalog), in one
 * transaction. Returns how many types it added (0 when the library already had types).
 */
export async function seedTypeLibrary(db: HubDb): Promise<number> {
  const fill = async (trx: HubDb) => {
    if ((await countTypes(trx)) > 0) return 0;
    for (const t of VALVE_TYPES) await insertType(trx, catalogEntryInput(t), null);
    return VALVE_TYPES.length;
  };
  // The Migrator may already run this inside its own transaction.
  return db.isTransaction ? fill(db) : db.transaction().execute(fill);
}

/**
 * The seed as a step of the migration list: it runs once per database, in every mode, right
 * after the tables exist. An admin who later deletes types does not see them come back.
 */
export const typeLibrarySeed: Migration = {
  // eslint-disable-next-line @typescript-eslint/no-explicit-any -- the Migrator's own type
  up: async (db: Kysely<any>) => {
    await seedTypeLibrary(db as Kysely<Database>);
  },
  // Nothing to undo apart: the rows go with the tables when the library migration is undone.
  down: async () => {},
};
