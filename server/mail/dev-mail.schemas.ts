import { z } from 'zod';

/** Query of GET /api/dev-mail. */
export const devMailListQuery = z.object({
  limit: z.coerce.number().int().min(1).max(200).default(50),
});

/** Characters of a message's text the list shows. */
export const TEXT_PREVIEW_CHARS = 400;

/** A message the development mail server received. */
export const devMailSchema = z.object({
  id: z.number().int(),
  receivedAt: z.string(),
  envelopeFrom: z.string().nullable(),
  envelopeTo: z.array(z.string()),
  subject: z.string().nullable(),
  from: z.string().nullable(),
  to: z.string().nullable(),
  messageId: z.string().nullable(),
  textPreview: z
    .string()
    .nullable()
    .describe(`The message's plain text, at most ${TEXT_PREVIEW_CHARS} characters`),
  attachments: z.array(
    z.object({
      index: z.number().int(),
      filename: z.string(),
      contentType: z.string(),
      bytes: z.number().int(),
    }),
  ),
});

/** Params of GET /api/dev-mail/:id/attachments/:n. */
export const devMailAttachmentParams = z.object({
  id: z.coerce.number().int().positive(),
  n: z.coerce.number().int().min(0),
});
