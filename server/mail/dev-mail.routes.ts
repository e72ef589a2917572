import type { Router } from 'express';
import type { HubDb } from '../db/database';
import { notFound } from '../http/http-error';
import type { ApiMount } from '../route-table';
import { findReceived, listReceived } from './dev-mail.repository';
import { TEXT_PREVIEW_CHARS } from './dev-mail.schemas';
import { parseRawMessage } from './raw-message';

function preview(text: string): string {
  const trimmed = text.trim();
  return trimmed.length <= TEXT_PREVIEW_CHARS
    ? trimmed
    : `${trimmed.slice(0, TEXT_PREVIEW_CHARS - 1).trimEnd()}…`;
}

/** /api/dev-mail: what the development mail server received (admin only). */
export function registerDevMailRoutes(router: Router, mount: ApiMount, db: HubDb): void {
  mount(router, 'GET /api/dev-mail', async ({ query }) => {
    const rows = await listReceived(db, query.limit);
    return rows.map((r) => {
      const m = parseRawMessage(r.raw);
      return {
        id: r.id,
        receivedAt: r.received_at,
        envelopeFrom: r.envelope_from,
        envelopeTo: JSON.parse(r.envelope_to_json) as string[],
        subject: m.subject,
        from: m.from,
        to: m.to,
        messageId: m.messageId,
        textPreview: m.text === null ? null : preview(m.text),
        attachments: m.attachments.map((a, index) => ({
          index,
          filename: a.filename,
          contentType: a.contentType,
          bytes: a.content.length,
        })),
      };
    });
  });
  mount(router, 'GET /api/dev-mail/:id/attachments/:n', async ({ params }, res) => {
    const row = await findReceived(db, params.id);
    if (!row) throw notFound('message', params.id);
    const a = parseRawMessage(row.raw).attachments[params.n];
    if (!a) throw notFound('attachment', params.n);
    res.status(200).type(a.contentType).attachment(a.filename).send(a.content);
  });
}
