import { sql, type Selectable } from 'kysely';
import type { HubDb } from '../db/database';
import type {
  NominalCurveSetTable,
  NominalPointTable,
  TypeOperatingPointTable,
  TypeRatingsTable,
  ValveTypeTable,
} from './valve-type.table';
import type { ValveTypeInput } from './valve-type.schemas';

/** A type row with its operating points (by position), ratings and nominal-curve summary. */
export interface ValveTypeRecord {
  type: Selectable<ValveTypeTable>;
  operatingPoints: Selectable<TypeOperatingPointTable>[];
  ratings: Selectable<TypeRatingsTable>;
  nominal: (Selectable<NominalCurveSetTable> & { uploader: string | null }) | null;
}

async function assemble(
  db: HubDb,
  types: Selectable<ValveTypeTable>[],
): Promise<ValveTypeRecord[]> {
  if (types.length === 0) return [];
  const ids = types.map((t) => t.id);
  const [points, ratings, sets] = await Promise.all([
    db
      .selectFrom('type_operating_points')
      .selectAll()
      .where('valve_type_id', 'in', ids)
      .orderBy('valve_type_id')
      .orderBy('position')
      .execute(),
    db.selectFrom('type_ratings').selectAll().where('valve_type_id', 'in', ids).execute(),
    db
      .selectFrom('nominal_curve_sets')
      .leftJoin('users', 'users.id', 'nominal_curve_sets.uploaded_by')
      .selectAll('nominal_curve_sets')
      .select('users.username as uploader')
      .where('valve_type_id', 'in', ids)
      .execute(),
  ]);
  return types.map((type) => {
    const r = ratings.find((x) => x.valve_type_id === type.id);
    // The schema gives every type its ratings row in the same transaction as the type.
    if (!r) throw new Error(`valve type ${type.designation} has no ratings row`);
    return {
      type,
      operatingPoints: points.filter((p) => p.valve_type_id === type.id),
      ratings: r,
      nominal: sets.find((s) => s.valve_type_id === type.id) ?? null,
    };
  });
}

/** Every type, in the order they were added (the catalog's order for the seeded ones). */
export async function listTypeRecords(db: HubDb): Promise<ValveTypeRecord[]> {
  const types = await db.selectFrom('valve_types').selectAll().orderBy('id').execute();
  return assemble(db, types);
}

/** The type named by designation or one of its equivalents, any case; undefined if none. */
export async function findTypeRecord(
  db: HubDb,
  name: string,
): Promise<ValveTypeRecord | undefined> {
  const key = name.trim();
  const type = await db
    .selectFrom('valve_types')
    .selectAll()
    .where((eb) =>
      eb.or([
        eb('designation', '=', key),
        sql<boolean>`exists (select 1 from json_each(${eb.ref('equivalents_json')})
          where upper(json_each.value) = upper(${key}))`,
      ]),
    )
    .orderBy(sql`${sql.ref('designation')} = ${key}`, 'desc')
    .executeTakeFirst();
  return type ? (await assemble(db, [type]))[0] : undefined;
}

/** The type with this id, or undefined. */
export async function findTypeRecordById(
  db: HubDb,
  id: number,
): Promise<ValveTypeRecord | undefined> {
  const type = await db
    .selectFrom('valve_types')
    .selectAll()
    .where('id', '=', id)
    .executeTakeFirst();
  return type ? (await assemble(db, [type]))[0] : undefined;
}

/** Types whose designation or equivalents use any of `names` (any case), except `exceptId`. */
export async function typesUsingNames(
  db: HubDb,
  names: readonly string[],
  exceptId: number | null,
): Promise<string[]> {
  const upper = names.map((n) => n.toUpperCase());
  const rows = await db
    .selectFrom('valve_types')
    .select(['id', 'designation', 'equivalents_json'])
    .execute();
  return rows
    .filter((r) => r.id !== exceptId)
    .filter((r) =>
      [r.designation, ...(JSON.parse(r.equivalents_json) as string[])].some((n) =>
        upper.includes(n.toUpperCase()),
      ),
    )
    .map((r) => r.designation);
}

/** Number of types in the library. */
export async function countTypes(db: HubDb): Promise<number> {
  const r = await db
    .selectFrom('valve_types')
    .select((eb) => eb.fn.countAll<number>().as('n'))
    .executeTakeFirstOrThrow();
  return Number(r.n);
}

function typeColumns(t: ValveTypeInput) {
  return {
    equivalents_json: JSON.stringify(t.equivalents ?? []),
    valve_class: t.valveClass,
    base: t.base,
    sections: t.sections,
    heater_volts: t.heaterVolts,
    heater_amps: t.heaterAmps,
    model_kind: t.model?.kind ?? null,
    model_params_json: t.model ? JSON.stringify(t.model.params) : null,
    model_source: t.model?.source ?? null,
    notes: t.notes ?? null,
  };
}

async function writeFigures(db: HubDb, typeId: number, t: ValveTypeInput): Promise<void> {
  await db.deleteFrom('type_operating_points').where('valve_type_id', '=', typeId).execute();
  await db
    .insertInto('type_operating_points')
    .values(
      t.operatingPoints.map((op, position) => ({
        valve_type_id: typeId,
        position,
        va_volts: op.vaVolts,
        vg2_volts: op.vg2Volts ?? null,
        vg1_volts: op.vg1Volts,
        ia_milliamps: op.iaMilliamps,
        ig2_milliamps: op.ig2Milliamps ?? null,
        gm_microsiemens: op.gmMicrosiemens ?? null,
        ra_kiloohms: op.raKiloohms ?? null,
        mu: op.mu ?? null,
        source: op.source,
        confidence: op.confidence ?? null,
      })),
    )
    .execute();
  const r = t.ratings;
  const ratings = {
    va_max_volts: r.vaMaxVolts,
    vg2_max_volts: r.vg2MaxVolts ?? null,
    pa_max_watts: r.paMaxWatts,
    pg2_max_watts: r.pg2MaxWatts ?? null,
    ik_max_milliamps: r.ikMaxMilliamps ?? null,
    vhk_max_volts: r.vhkMaxVolts ?? null,
    source: r.source,
    confidence: r.confidence ?? null,
  };
  await db
    .insertInto('type_ratings')
    .values({ valve_type_id: typeId, ...ratings })
    .onConflict((oc) => oc.column('valve_type_id').doUpdateSet(ratings))
    .execute();
}

/** Inserts a type with its figures (call inside a transaction); returns its id. */
export async function insertType(
  db: HubDb,
  t: ValveTypeInput,
  userId: number | null,
): Promise<number> {
  const now = new Date().toISOString();
  const { id } = await db
    .insertInto('valve_types')
    .values({
      designation: t.designation,
      ...typeColumns(t),
      created_at: now,
      updated_at: now,
      updated_by: userId,
    })
    .returning('id')
    .executeTakeFirstOrThrow();
  await writeFigures(db, id, t);
  return id;
}

/** Replaces every field and figure of a type (call inside a transaction). */
export async function replaceType(
  db: HubDb,
  typeId: number,
  t: ValveTypeInput,
  userId: number | null,
): Promise<void> {
  await db
    .updateTable('valve_types')
    .set({ ...typeColumns(t), updated_at: new Date().toISOString(), updated_by: userId })
    .where('id', '=', typeId)
    .execute();
  await writeFigures(db, typeId, t);
}

/** Deletes a type with its figures and nominal curves. */
export async function deleteType(db: HubDb, typeId: number): Promise<void> {
  await db.deleteFrom('valve_types').where('id', '=', typeId).execute();
}

/** Rows a single INSERT of nominal points carries (6 bound values a row). */
const NOMINAL_ROWS_PER_INSERT = 2000;

/** A nominal point to store: V, V, mA, mA. */
export type NominalPointInput = Omit<NominalPointTable, 'valve_type_id' | 'seq'>;

/** Replaces a type's nominal curves (call inside a transaction). */
export async function replaceNominalCurves(
  db: HubDb,
  typeId: number,
  source: string,
  points: readonly NominalPointInput[],
  userId: number,
): Promise<void> {
  await db.deleteFrom('nominal_points').where('valve_type_id', '=', typeId).execute();
  const set = {
    source,
    point_count: points.length,
    uploaded_by: userId,
    uploaded_at: new Date().toISOString(),
  };
  await db
    .insertInto('nominal_curve_sets')
    .values({ valve_type_id: typeId, ...set })
    .onConflict((oc) => oc.column('valve_type_id').doUpdateSet(set))
    .execute();
  for (let i = 0; i < points.length; i += NOMINAL_ROWS_PER_INSERT) {
    await db
      .insertInto('nominal_points')
      .values(
        points
          .slice(i, i + NOMINAL_ROWS_PER_INSERT)
          .map((p, j) => ({ valve_type_id: typeId, seq: i + j, ...p })),
      )
      .execute();
  }
}

/** A type's nominal points in stored order. */
export function listNominalPoints(db: HubDb, typeId: number) {
  return db
    .selectFrom('nominal_points')
    .selectAll()
    .where('valve_type_id', '=', typeId)
    .orderBy('seq')
    .execute();
}

/** How many valve records are of this type. */
export async function countValvesOfType(db: HubDb, typeId: number): Promise<number> {
  const r = await db
    .selectFrom('valves')
    .select((eb) => eb.fn.countAll<number>().as('n'))
    .where('valve_type_id', '=', typeId)
    .executeTakeFirstOrThrow();
  return Number(r.n);
}
