import { sql, type Kysely } from 'kysely';

/** Quick-test statuses as of this migration (frozen here; later ones may widen the check). */
const STATUSES = ['pending', 'running', 'complete', 'aborted', 'link-lost', 'failed'];

/**
 * Quick tests: one row per quick-test set run on a bench, its plan (the checks and the
 * reference figures), what each check read, the part results and the grade, as JSON text.
 * valve_id names a valve record but is not a foreign key: records may be deleted, a quick test
 * stays in the workshop's history with its label.
 */
// eslint-disable-next-line @typescript-eslint/no-explicit-any -- frozen in time: no typed schema
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema
    .createTable('quick_tests')
    .addColumn('id', 'integer', (c) => c.primaryKey().autoIncrement())
    .addColumn('bench_id', 'integer', (c) => c.notNull().references('benches.id'))
    .addColumn('valve_type', 'text', (c) => c.notNull())
    .addColumn('valve_id', 'integer')
    .addColumn('valve_label', 'text')
    .addColumn('parts_json', 'text', (c) => c.notNull())
    .addColumn('plan_json', 'text', (c) => c.notNull())
    .addColumn('steps_json', 'text', (c) => c.notNull().defaultTo('[]'))
    .addColumn('results_json', 'text', (c) => c.notNull().defaultTo('[]'))
    .addColumn('grade', 'text')
    .addColumn('grade_json', 'text')
    .addColumn('thresholds_json', 'text', (c) => c.notNull())
    .addColumn('operator_id', 'integer', (c) => c.notNull().references('users.id'))
    .addColumn('status', 'text', (c) =>
      c.notNull().check(sql`status in (${sql.join(STATUSES.map((s) => sql.lit(s)))})`),
    )
    .addColumn('end_message', 'text')
    .addColumn('created_at', 'text', (c) => c.notNull())
    .addColumn('started_at', 'text')
    .addColumn('ended_at', 'text')
    .execute();
  await db.schema
    .createIndex('quick_tests_created_at')
    .on('quick_tests')
    .column('created_at')
    .execute();
  await db.schema
    .createIndex('quick_tests_valve_created_at')
    .on('quick_tests')
    .columns(['valve_id', 'created_at'])
    .execute();
  // At most one unfinished quick test per bench, enforced by the database itself.
  await db.schema
    .createIndex('quick_tests_one_active_per_bench')
    .on('quick_tests')
    .column('bench_id')
    .unique()
    .where(sql.ref('status'), 'in', ['pending', 'running'])
    .execute();
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- frozen in time: no typed schema
export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.dropTable('quick_tests').execute();
}
