import { sql, type Kysely } from 'kysely';

/** Valve record statuses as of this migration (frozen here). */
const VALVE_STATUSES = ['in-stock', 'on-test', 'reserved', 'sold', 'customer', 'rejected'];

const oneOf = (column: string, values: readonly string[]) =>
  sql`${sql.ref(column)} in (${sql.join(values.map((v) => sql.lit(v)))})`;

/**
 * Valve records (one per physical valve), their photos, the workshop settings, the link from a
 * sweep to its valve, and the figures computed per sweep at the type's reference point.
 */
// eslint-disable-next-line @typescript-eslint/no-explicit-any -- frozen in time: no typed schema
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('workshop_settings')
    .addColumn('key', 'text', (c) => c.primaryKey())
    .addColumn('value_json', 'text', (c) => c.notNull())
    .addColumn('updated_by', 'integer', (c) => c.references('users.id'))
    .addColumn('updated_at', 'text', (c) => c.notNull())
    .execute();

  await db.schema
    .createTable('valves')
    .addColumn('id', 'integer', (c) => c.primaryKey().autoIncrement())
    .addColumn('label', 'text', (c) =>
      c
        .notNull()
        .unique()
        .modifyEnd(sql`collate nocase`),
    )
    .addColumn('valve_type_id', 'integer', (c) => c.notNull().references('valve_types.id'))
    .addColumn('maker', 'text')
    .addColumn('date_code', 'text')
    .addColumn('origin_kind', 'text', (c) =>
      c.check(oneOf('origin_kind', ['lot', 'supplier', 'customer'])),
    )
    .addColumn('origin_text', 'text')
    .addColumn('location', 'text')
    .addColumn('status', 'text', (c) => c.notNull().check(oneOf('status', VALVE_STATUSES)))
    .addColumn('notes', 'text')
    .addColumn('created_by', 'integer', (c) => c.references('users.id'))
    .addColumn('updated_by', 'integer', (c) => c.references('users.id'))
    .addColumn('created_at', 'text', (c) => c.notNull())
    .addColumn('updated_at', 'text', (c) => c.notNull())
    .execute();
  await db.schema.createIndex('valves_type').on('valves').column('valve_type_id').execute();
  await db.schema.createIndex('valves_status').on('valves').column('status').execute();
  await db.schema.createIndex('valves_updated_at').on('valves').column('updated_at').execute();

  await db.schema
    .createTable('attachments')
    .addColumn('id', 'integer', (c) => c.primaryKey().autoIncrement())
    .addColumn('valve_id', 'integer', (c) =>
      c.notNull().references('valves.id').onDelete('cascade'),
    )
    .addColumn('kind', 'text', (c) => c.notNull().check(oneOf('kind', ['photo'])))
    .addColumn('stored_name', 'text', (c) => c.notNull().unique())
    .addColumn('thumb_name', 'text')
    .addColumn('original_name', 'text', (c) => c.notNull())
    .addColumn('mime', 'text', (c) => c.notNull())
    .addColumn('bytes', 'integer', (c) => c.notNull())
    .addColumn('width', 'integer')
    .addColumn('height', 'integer')
    .addColumn('created_by', 'integer', (c) => c.references('users.id'))
    .addColumn('created_at', 'text', (c) => c.notNull())
    .execute();
  await db.schema.createIndex('attachments_valve').on('attachments').column('valve_id').execute();

  await db.schema
    .alterTable('sweeps')
    .addColumn('valve_id', 'integer', (c) => c.references('valves.id').onDelete('set null'))
    .execute();
  await db.schema
    .createIndex('sweeps_valve_created_at')
    .on('sweeps')
    .columns(['valve_id', 'created_at'])
    .execute();

  // Figures of a sweep at its type's reference operating point (V, mA, µS, kΩ, %), computed
  // from point_count points; refusal says why there are none.
  await db.schema
    .createTable('sweep_figures')
    .addColumn('sweep_id', 'integer', (c) =>
      c.primaryKey().references('sweeps.id').onDelete('cascade'),
    )
    .addColumn('point_count', 'integer', (c) => c.notNull())
    .addColumn('va_volts', 'real')
    .addColumn('vg1_volts', 'real')
    .addColumn('vg2_volts', 'real')
    .addColumn('nominal_ia_milliamps', 'real')
    .addColumn('nominal_gm_microsiemens', 'real')
    .addColumn('ia_milliamps', 'real')
    .addColumn('gm_microsiemens', 'real')
    .addColumn('ra_kiloohms', 'real')
    .addColumn('mu', 'real')
    .addColumn('ia_percent', 'real')
    .addColumn('gm_percent', 'real')
    .addColumn('refusal', 'text')
    .addColumn('computed_at', 'text', (c) => c.notNull())
    .execute();
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- frozen in time: no typed schema
export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('sweep_figures').execute();
  await db.schema.dropIndex('sweeps_valve_created_at').execute();
  await db.schema.alterTable('sweeps').dropColumn('valve_id').execute();
  await db.schema.dropTable('attachments').execute();
  await db.schema.dropTable('valves').execute();
  await db.schema.dropTable('workshop_settings').execute();
}
