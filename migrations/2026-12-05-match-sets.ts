import { sql, type Kysely } from 'kysely';

const oneOf = (column: string, values: readonly string[]) =>
  sql`${sql.ref(column)} in (${sql.join(values.map((v) => sql.lit(v)))})`;

/**
 * Matching runs, match sets with their members, the report mailings and buyer links of a set,
 * and the messages the development mail server received.
 */
// eslint-disable-next-line @typescript-eslint/no-explicit-any -- frozen in time: no typed schema
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('match_runs')
    .addColumn('id', 'integer', (c) => c.primaryKey().autoIncrement())
    .addColumn('valve_type', 'text', (c) => c.notNull())
    .addColumn('criteria_json', 'text', (c) => c.notNull())
    .addColumn('result_json', 'text', (c) => c.notNull())
    .addColumn('created_by', 'integer', (c) => c.references('users.id'))
    .addColumn('created_at', 'text', (c) => c.notNull())
    .execute();

  await db.schema
    .createTable('match_sets')
    .addColumn('id', 'integer', (c) => c.primaryKey().autoIncrement())
    .addColumn('code', 'text', (c) => c.unique())
    .addColumn('valve_type', 'text', (c) => c.notNull())
    .addColumn('criteria_json', 'text', (c) => c.notNull())
    .addColumn('figures_json', 'text', (c) => c.notNull())
    .addColumn('run_id', 'integer', (c) => c.references('match_runs.id').onDelete('set null'))
    .addColumn('status', 'text', (c) =>
      c.notNull().check(oneOf('status', ['reserved', 'sold', 'released'])),
    )
    .addColumn('created_by', 'integer', (c) => c.references('users.id'))
    .addColumn('created_at', 'text', (c) => c.notNull())
    .addColumn('updated_at', 'text', (c) => c.notNull())
    .execute();
  await db.schema
    .createIndex('match_sets_created_at')
    .on('match_sets')
    .column('created_at')
    .execute();

  await db.schema
    .createTable('match_set_members')
    .addColumn('match_set_id', 'integer', (c) =>
      c.notNull().references('match_sets.id').onDelete('cascade'),
    )
    .addColumn('position', 'integer', (c) => c.notNull())
    .addColumn('valve_id', 'integer', (c) => c.notNull().references('valves.id'))
    .addColumn('sweep_id', 'integer', (c) => c.references('sweeps.id').onDelete('set null'))
    .addPrimaryKeyConstraint('match_set_members_pk', ['match_set_id', 'position'])
    .execute();
  await db.schema
    .createIndex('match_set_members_valve')
    .on('match_set_members')
    .column('valve_id')
    .execute();

  await db.schema
    .createTable('match_set_mailings')
    .addColumn('id', 'integer', (c) => c.primaryKey().autoIncrement())
    .addColumn('match_set_id', 'integer', (c) =>
      c.notNull().references('match_sets.id').onDelete('cascade'),
    )
    .addColumn('to_address', 'text', (c) => c.notNull())
    .addColumn('message_id', 'text')
    .addColumn('sent_by', 'integer', (c) => c.references('users.id'))
    .addColumn('sent_at', 'text', (c) => c.notNull())
    .execute();

  await db.schema
    .createTable('match_set_shares')
    .addColumn('id', 'integer', (c) => c.primaryKey().autoIncrement())
    .addColumn('match_set_id', 'integer', (c) =>
      c.notNull().references('match_sets.id').onDelete('cascade'),
    )
    .addColumn('token_hash', 'text', (c) => c.notNull().unique())
    .addColumn('expires_at', 'text', (c) => c.notNull())
    .addColumn('revoked_at', 'text')
    .addColumn('created_by', 'integer', (c) => c.references('users.id'))
    .addColumn('created_at', 'text', (c) => c.notNull())
    .execute();

  await db.schema
    .createTable('outbox_received')
    .addColumn('id', 'integer', (c) => c.primaryKey().autoIncrement())
    .addColumn('envelope_from', 'text')
    .addColumn('envelope_to_json', 'text', (c) => c.notNull())
    .addColumn('raw', 'text', (c) => c.notNull())
    .addColumn('received_at', 'text', (c) => c.notNull())
    .execute();
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- frozen in time: no typed schema
export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('outbox_received').execute();
  await db.schema.dropTable('match_set_shares').execute();
  await db.schema.dropTable('match_set_mailings').execute();
  await db.schema.dropTable('match_set_members').execute();
  await db.schema.dropTable('match_sets').execute();
  await db.schema.dropTable('match_runs').execute();
}
