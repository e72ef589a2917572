import { sql, type Kysely } from 'kysely';

/** Construction classes as of this migration (frozen here). */
const VALVE_CLASSES = [
  'diode',
  'triode',
  'double-triode',
  'tetrode',
  'beam-tetrode',
  'pentode',
  'rectifier',
];

const oneOf = (column: string, values: readonly string[]) =>
  sql`${sql.ref(column)} in (${sql.join(values.map((v) => sql.lit(v)))})`;

/**
 * The type library: valve types with their typical operating points, maximum ratings and
 * nominal curves, each figure with its source. Units: V, mA, µS, kΩ, W, A.
 */
// eslint-disable-next-line @typescript-eslint/no-explicit-any -- frozen in time: no typed schema
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('valve_types')
    .addColumn('id', 'integer', (c) => c.primaryKey().autoIncrement())
    .addColumn('designation', 'text', (c) =>
      c
        .notNull()
        .unique()
        .modifyEnd(sql`collate nocase`),
    )
    .addColumn('equivalents_json', 'text', (c) => c.notNull().defaultTo('[]'))
    .addColumn('valve_class', 'text', (c) => c.notNull().check(oneOf('valve_class', VALVE_CLASSES)))
    .addColumn('base', 'text', (c) => c.notNull())
    .addColumn('sections', 'integer', (c) => c.notNull())
    .addColumn('heater_volts', 'real', (c) => c.notNull())
    .addColumn('heater_amps', 'real', (c) => c.notNull())
    .addColumn('model_kind', 'text', (c) => c.check(oneOf('model_kind', ['triode', 'pentode'])))
    .addColumn('model_params_json', 'text')
    .addColumn('model_source', 'text')
    .addColumn('notes', 'text')
    .addColumn('created_at', 'text', (c) => c.notNull())
    .addColumn('updated_at', 'text', (c) => c.notNull())
    .addColumn('updated_by', 'integer', (c) => c.references('users.id'))
    .execute();

  // position 0 is the reference point: grading and figures are taken there.
  await db.schema
    .createTable('type_operating_points')
    .addColumn('id', 'integer', (c) => c.primaryKey().autoIncrement())
    .addColumn('valve_type_id', 'integer', (c) =>
      c.notNull().references('valve_types.id').onDelete('cascade'),
    )
    .addColumn('position', 'integer', (c) => c.notNull())
    .addColumn('va_volts', 'real', (c) => c.notNull())
    .addColumn('vg2_volts', 'real')
    .addColumn('vg1_volts', 'real', (c) => c.notNull())
    .addColumn('ia_milliamps', 'real', (c) => c.notNull())
    .addColumn('ig2_milliamps', 'real')
    .addColumn('gm_microsiemens', 'real')
    .addColumn('ra_kiloohms', 'real')
    .addColumn('mu', 'real')
    .addColumn('source', 'text', (c) => c.notNull())
    .addColumn('confidence', 'text')
    .addUniqueConstraint('type_operating_points_position', ['valve_type_id', 'position'])
    .execute();

  await db.schema
    .createTable('type_ratings')
    .addColumn('valve_type_id', 'integer', (c) =>
      c.primaryKey().references('valve_types.id').onDelete('cascade'),
    )
    .addColumn('va_max_volts', 'real', (c) => c.notNull())
    .addColumn('vg2_max_volts', 'real')
    .addColumn('pa_max_watts', 'real', (c) => c.notNull())
    .addColumn('pg2_max_watts', 'real')
    .addColumn('ik_max_milliamps', 'real')
    .addColumn('vhk_max_volts', 'real')
    .addColumn('source', 'text', (c) => c.notNull())
    .addColumn('confidence', 'text')
    .execute();

  await db.schema
    .createTable('nominal_curve_sets')
    .addColumn('valve_type_id', 'integer', (c) =>
      c.primaryKey().references('valve_types.id').onDelete('cascade'),
    )
    .addColumn('source', 'text', (c) => c.notNull())
    .addColumn('point_count', 'integer', (c) => c.notNull())
    .addColumn('uploaded_by', 'integer', (c) => c.references('users.id'))
    .addColumn('uploaded_at', 'text', (c) => c.notNull())
    .execute();

  await db.schema
    .createTable('nominal_points')
    .addColumn('valve_type_id', 'integer', (c) =>
      c.notNull().references('nominal_curve_sets.valve_type_id').onDelete('cascade'),
    )
    .addColumn('seq', 'integer', (c) => c.notNull())
    .addColumn('vg1_volts', 'real', (c) => c.notNull())
    .addColumn('va_volts', 'real', (c) => c.notNull())
    .addColumn('ia_milliamps', 'real', (c) => c.notNull())
    .addColumn('ig2_milliamps', 'real')
    .addPrimaryKeyConstraint('nominal_points_pk', ['valve_type_id', 'seq'])
    .modifyEnd(sql`without rowid`)
    .execute();
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- frozen in time: no typed schema
export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('nominal_points').execute();
  await db.schema.dropTable('nominal_curve_sets').execute();
  await db.schema.dropTable('type_ratings').execute();
  await db.schema.dropTable('type_operating_points').execute();
  await db.schema.dropTable('valve_types').execute();
}
