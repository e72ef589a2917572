import type { HubDb } from '../db/database';
import type { Logger } from '../http/error-middleware';
import { readSettingValues, writeSettingValues } from '../settings/settings.repository';
import { findTypeRecord } from '../valve-types/valve-type.repository';
import { DEMO_WORKSHOP } from './demo-data';
import { DEMO_LABEL_PREFIX, DEMO_STOCK } from './demo-stock';

/**
 * Seeds the demo stock into an empty valves table, in one transaction, and sets the label
 * scheme to the demo workshop's prefix (unless an admin has set one) so that new valves
 * continue its numbering. Returns the number of valves added (0 when the table had valves).
 */
export async function seedDemoStock(db: HubDb, logger: Logger): Promise<number> {
  const added = await db.transaction().execute(async (trx) => {
    const any = await trx.selectFrom('valves').select('id').limit(1).executeTakeFirst();
    if (any) return 0;
    const admin = await trx
      .selectFrom('users')
      .select('id')
      .where('username', '=', 'admin')
      .executeTakeFirst();
    const now = new Date().toISOString();
    for (const v of DEMO_STOCK) {
      const type = await findTypeRecord(trx, v.type);
      // An admin may have removed the type from the library: leave its valves out.
      if (!type) continue;
      await trx
        .insertInto('valves')
        .values({
          label: v.label,
          valve_type_id: type.type.id,
          maker: v.maker,
          date_code: v.dateCode,
          origin_kind: v.originKind,
          origin_text: v.originText,
          location: v.location,
          status: v.status,
          notes: v.notes,
          created_by: admin?.id ?? null,
          updated_by: admin?.id ?? null,
          created_at: now,
          updated_at: now,
        })
        .execute();
    }
    const stored = await readSettingValues(trx);
    if (!('labelPrefix' in stored)) {
      await writeSettingValues(
        trx,
        { labelPrefix: DEMO_LABEL_PREFIX, labelDigits: 4, nextLabelNumber: DEMO_STOCK.length + 1 },
        null,
      );
    }
    return DEMO_STOCK.length;
  });
  if (added > 0) logger.info(`demo stock of ${DEMO_WORKSHOP} created (${added} valves)`);
  return added;
}
