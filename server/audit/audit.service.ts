import type { z } from 'zod';
import type { AuthUser } from '../auth/auth-user';
import type { HubDb } from '../db/database';
import type { auditEntrySchema, auditListQuery } from './audit.schemas';
import { insertAuditEntry, listAuditEntries } from './audit.repository';

/** One audit entry as the API shows it. */
export type AuditEntry = z.infer<typeof auditEntrySchema>;

/** Records who did what; the log is append-only. */
export type AuditService = ReturnType<typeof createAuditService>;

/** Builds the audit service. */
export function createAuditService({ db }: { db: HubDb }) {
  return {
    /**
     * Appends an entry. `action` is `area.verb` (auth.login, sweep.start, sweep.abort,
     * bench.create, bench.update); `subject` names the thing acted on (`sweep:12`).
     */
    async record(
      user: AuthUser | null,
      action: string,
      subject: string | null,
      detail: unknown,
    ): Promise<void> {
      await insertAuditEntry(db, {
        user_id: user?.id ?? null,
        username: user?.username ?? null,
        action,
        subject,
        detail_json: detail === null || detail === undefined ? null : JSON.stringify(detail),
        at: new Date().toISOString(),
      });
    },

    /** A page of entries, newest first. */
    async list(q: z.output<typeof auditListQuery>) {
      const { rows, total } = await listAuditEntries(db, {
        action: q.action,
        limit: q.pageSize,
        offset: (q.page - 1) * q.pageSize,
      });
      const items: AuditEntry[] = rows.map((r) => ({
        id: r.id,
        userId: r.user_id,
        username: r.username,
        action: r.action,
        subject: r.subject,
        detail: r.detail_json === null ? null : JSON.parse(r.detail_json),
        at: r.at,
      }));
      return { items, total, page: q.page, pageSize: q.pageSize };
    },
  };
}
