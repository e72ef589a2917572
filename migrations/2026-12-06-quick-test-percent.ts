import { sql, type Kysely } from 'kysely';

/**
 * Keeps a quick test's graded figure (gm or emission as % of nominal) in a column, so that a
 * valve's grade can be taken from its newest sweep or quick test in one query. Tests already
 * graded get it from their stored part results: the lower of the gm and emission percentages.
 */
// eslint-disable-next-line @typescript-eslint/no-explicit-any -- frozen in time: no typed schema
export async function up(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable('quick_tests').addColumn('grade_percent', 'real').execute();
  await sql`
    update quick_tests set grade_percent = (
      select min(coalesce(json_extract(p.value, '$.result.gmPercent'),
                          json_extract(p.value, '$.result.percent')))
      from json_each(quick_tests.results_json) as p
      where json_extract(p.value, '$.status') = 'done'
        and json_extract(p.value, '$.part') in ('gm', 'emission'))
    where status = 'complete'`.execute(db);
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- frozen in time: no typed schema
export async function down(db: Kysely<any>): Promise<void> {
  await db.schema.alterTable('quick_tests').dropColumn('grade_percent').execute();
}
