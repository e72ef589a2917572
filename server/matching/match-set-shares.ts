import { createHash, randomBytes } from 'node:crypto';
import type { z } from 'zod';
import type { AuditService } from '../audit/audit.service';
import type { AuthUser } from '../auth/auth-user';
import type { HubDb } from '../db/database';
import { HttpError, notFound } from '../http/http-error';
import { findMatchSet, findShareByHash, insertShare, revokeShare } from './match-set.repository';
import { matchReportView } from './match-report-view';
import type { sharedMatchSetSchema } from './match-set.schemas';
import type { MatchSetService } from './match-set.service';

/** Hash under which a share token is stored (SHA-256, hex). */
export function shareTokenHash(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

async function requireSet(db: HubDb, id: number) {
  const set = await findMatchSet(db, id);
  if (!set) throw notFound('match_set', id);
  return set;
}

/** Buyers' read-only links to match sets. */
export type MatchSetShares = ReturnType<typeof createMatchSetShares>;

/** Builds the buyer-link service over the match sets. */
export function createMatchSetShares({
  db,
  audit,
  sets,
}: {
  db: HubDb;
  audit: AuditService;
  sets: Pick<MatchSetService, 'report'>;
}) {
  const report = (id: number) => sets.report(id);

  /** The set behind a buyer's token: 404 unknown, 410 expired or revoked. */
  async function sharedSetId(token: string): Promise<{ setId: number; expiresAt: string }> {
    const share = await findShareByHash(db, shareTokenHash(token));
    if (!share) throw new HttpError(404, 'share_not_found', 'no such link');
    if (share.revoked_at !== null || share.expires_at <= new Date().toISOString()) {
      throw new HttpError(410, 'share_gone', 'this link has expired or was withdrawn');
    }
    return { setId: share.match_set_id, expiresAt: share.expires_at };
  }

  return {
    sharedSetId,

    /** Makes a buyer's link; the token is answered once and stored only as a hash. */
    async share(id: number, expiresInDays: number, user: AuthUser, origin: string) {
      const set = await requireSet(db, id);
      const token = randomBytes(24).toString('base64url');
      const now = new Date();
      const expiresAt = new Date(now.getTime() + expiresInDays * 86_400_000).toISOString();
      const shareId = await insertShare(db, {
        match_set_id: id,
        token_hash: shareTokenHash(token),
        expires_at: expiresAt,
        revoked_at: null,
        created_by: user.id,
        created_at: now.toISOString(),
      });
      await audit.record(user, 'match-set.share', `match-set:${id}`, {
        code: set.code,
        shareId,
        expiresAt,
      });
      // The buyer opens the app's own page; the PDF stays a plain API download.
      const url = `${origin}/shared/${token}`;
      const reportUrl = `${origin}/api/shared/match-sets/${token}/report.pdf`;
      return { id: shareId, url, reportUrl, token, expiresAt };
    },

    /** Revokes a buyer's link. */
    async revokeShare(id: number, shareId: number, user: AuthUser): Promise<void> {
      await requireSet(db, id);
      if (!(await revokeShare(db, id, shareId, new Date().toISOString()))) {
        throw notFound('share', shareId);
      }
      await audit.record(user, 'match-set.unshare', `match-set:${id}`, { shareId });
    },

    /** What a buyer's link shows. */
    async sharedView(token: string): Promise<z.infer<typeof sharedMatchSetSchema>> {
      const { setId, expiresAt } = await sharedSetId(token);
      return { ...matchReportView(await report(setId)), expiresAt };
    },
  };
}
