import { z } from 'zod';
import { pageFields, pageOf } from '../http/common-schemas';

/** Query of GET /api/audit. */
export const auditListQuery = z.object({
  ...pageFields,
  action: z.string().max(64).optional().describe('Only this action, e.g. sweep.start'),
});

/** One audit entry as the API shows it. */
export const auditEntrySchema = z.object({
  id: z.number().int(),
  userId: z.number().int().nullable(),
  username: z.string().nullable(),
  action: z.string(),
  subject: z.string().nullable(),
  detail: z.unknown(),
  at: z.string(),
});

/** Answer of GET /api/audit. */
export const auditPage = pageOf(auditEntrySchema);
