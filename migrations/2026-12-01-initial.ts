import { sql, type Kysely } from 'kysely';

/** Sweep statuses as of this migration (frozen here; later ones may widen the check). */
const SWEEP_STATUSES = ['pending', 'running', 'complete', 'aborted', 'limit', 'fault', 'link-lost'];

/**
 * First schema of the hub. Frozen: later changes go in new dated files.
 * Times are ISO-8601 UTC text; booleans are 0/1 integers; JSON is stored as text.
 */
// eslint-disable-next-line @typescript-eslint/no-explicit-any -- frozen in time: no typed schema
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('users')
    .addColumn('id', 'integer', (c) => c.primaryKey().autoIncrement())
    .addColumn('username', 'text', (c) => c.notNull().unique())
    .addColumn('display_name', 'text', (c) => c.notNull())
    .addColumn('password_hash', 'text', (c) => c.notNull())
    .addColumn('role', 'text', (c) =>
      c.notNull().check(sql`role in ('admin', 'technician', 'viewer')`),
    )
    .addColumn('created_at', 'text', (c) => c.notNull())
    .execute();

  await db.schema
    .createTable('benches')
    .addColumn('id', 'integer', (c) => c.primaryKey().autoIncrement())
    .addColumn('name', 'text', (c) => c.notNull().unique())
    .addColumn('token_hash', 'text', (c) => c.notNull().unique())
    .addColumn('va_max_volts', 'real', (c) => c.notNull())
    .addColumn('vg2_max_volts', 'real', (c) => c.notNull())
    .addColumn('ia_max_milliamps', 'real', (c) => c.notNull())
    .addColumn('pa_max_watts', 'real', (c) => c.notNull())
    .addColumn('capabilities_json', 'text')
    .addColumn('last_seen_at', 'text')
    .addColumn('created_at', 'text', (c) => c.notNull())
    .execute();

  await db.schema
    .createTable('sweeps')
    .addColumn('id', 'integer', (c) => c.primaryKey().autoIncrement())
    .addColumn('bench_id', 'integer', (c) => c.notNull().references('benches.id'))
    .addColumn('valve_type', 'text')
    .addColumn('valve_label', 'text')
    .addColumn('plan_json', 'text', (c) => c.notNull())
    .addColumn('operator_id', 'integer', (c) => c.notNull().references('users.id'))
    .addColumn('status', 'text', (c) =>
      c.notNull().check(sql`status in (${sql.join(SWEEP_STATUSES.map((s) => sql.lit(s)))})`),
    )
    .addColumn('end_reason', 'text')
    .addColumn('end_message', 'text')
    .addColumn('override', 'integer', (c) => c.notNull().defaultTo(0))
    .addColumn('override_by', 'integer', (c) => c.references('users.id'))
    .addColumn('reported_count', 'integer')
    .addColumn('point_count', 'integer', (c) => c.notNull().defaultTo(0))
    .addColumn('created_at', 'text', (c) => c.notNull())
    .addColumn('started_at', 'text')
    .addColumn('ended_at', 'text')
    .execute();

  await db.schema.createIndex('sweeps_created_at').on('sweeps').column('created_at').execute();
  await db.schema
    .createIndex('sweeps_bench_created_at')
    .on('sweeps')
    .columns(['bench_id', 'created_at'])
    .execute();
  // At most one unfinished sweep per bench, enforced by the database itself.
  await db.schema
    .createIndex('sweeps_one_active_per_bench')
    .on('sweeps')
    .column('bench_id')
    .unique()
    .where(sql.ref('status'), 'in', ['pending', 'running'])
    .execute();

  // Compact: the primary key is the storage order, so no rowid and no second index.
  await db.schema
    .createTable('sweep_points')
    .addColumn('sweep_id', 'integer', (c) =>
      c.notNull().references('sweeps.id').onDelete('cascade'),
    )
    .addColumn('seq', 'integer', (c) => c.notNull())
    .addColumn('curve', 'integer', (c) => c.notNull())
    .addColumn('va_volts', 'real', (c) => c.notNull())
    .addColumn('vg1_volts', 'real', (c) => c.notNull())
    .addColumn('vg2_volts', 'real', (c) => c.notNull())
    .addColumn('ia_milliamps', 'real', (c) => c.notNull())
    .addColumn('ig2_milliamps', 'real', (c) => c.notNull())
    .addPrimaryKeyConstraint('sweep_points_pk', ['sweep_id', 'seq'])
    .modifyEnd(sql`without rowid`)
    .execute();

  await db.schema
    .createTable('audit_log')
    .addColumn('id', 'integer', (c) => c.primaryKey().autoIncrement())
    .addColumn('user_id', 'integer', (c) => c.references('users.id'))
    .addColumn('username', 'text')
    .addColumn('action', 'text', (c) => c.notNull())
    .addColumn('subject', 'text')
    .addColumn('detail_json', 'text')
    .addColumn('at', 'text', (c) => c.notNull())
    .execute();
  await db.schema.createIndex('audit_log_at').on('audit_log').column('at').execute();
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- frozen in time: no typed schema
export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('audit_log').execute();
  await db.schema.dropTable('sweep_points').execute();
  await db.schema.dropTable('sweeps').execute();
  await db.schema.dropTable('benches').execute();
  await db.schema.dropTable('users').execute();
}
