import type { AuditLogRow, HubDb, NewAuditLogRow } from '../db/database';

/** Appends one entry. */
export async function insertAuditEntry(db: HubDb, row: NewAuditLogRow): Promise<void> {
  await db.insertInto('audit_log').values(row).execute();
}

/** Filter and page of the audit log. */
export interface AuditQuery {
  action?: string;
  limit: number;
  offset: number;
}

/** Entries, newest first, and how many match in all. */
export async function listAuditEntries(
  db: HubDb,
  q: AuditQuery,
): Promise<{ rows: AuditLogRow[]; total: number }> {
  let base = db.selectFrom('audit_log');
  if (q.action) base = base.where('action', '=', q.action);
  const rows = await base
    .selectAll()
    .orderBy('at', 'desc')
    .orderBy('id', 'desc')
    .limit(q.limit)
    .offset(q.offset)
    .execute();
  const count = await base
    .select((eb) => eb.fn.countAll<number>().as('n'))
    .executeTakeFirstOrThrow();
  return { rows, total: Number(count.n) };
}
