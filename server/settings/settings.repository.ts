import type { HubDb } from '../db/database';

/** Every stored setting, parsed. */
export async function readSettingValues(db: HubDb): Promise<Record<string, unknown>> {
  const rows = await db.selectFrom('workshop_settings').select(['key', 'value_json']).execute();
  return Object.fromEntries(rows.map((r) => [r.key, JSON.parse(r.value_json) as unknown]));
}

/** Stores settings, key by key. */
export async function writeSettingValues(
  db: HubDb,
  values: Record<string, unknown>,
  userId: number | null,
): Promise<void> {
  const now = new Date().toISOString();
  for (const [key, value] of Object.entries(values)) {
    const row = { value_json: JSON.stringify(value), updated_by: userId, updated_at: now };
    await db
      .insertInto('workshop_settings')
      .values({ key, ...row })
      .onConflict((oc) => oc.column('key').doUpdateSet(row))
      .execute();
  }
}
