import { z } from 'zod';

/** Path parameter `:id`, a positive integer. */
export const idParams = z.object({
  id: z.coerce.number().int().positive().describe('Id'),
});

/** Paging fields shared by list queries (1-based pages, at most 100 rows a page). */
export const pageFields = {
  page: z.coerce.number().int().min(1).default(1).describe('Page number, 1-based'),
  pageSize: z.coerce.number().int().min(1).max(100).default(25).describe('Rows a page, 1-100'),
};

/** A page of `item`. */
export function pageOf<T extends z.ZodType>(item: T) {
  return z.object({
    items: z.array(item),
    total: z.number().int().describe('Rows matching the filter, over all pages'),
    page: z.number().int(),
    pageSize: z.number().int(),
  });
}

/** The error shape of every 4xx/5xx answer. */
export const errorResponse = z.object({
  error: z.object({
    code: z.string().describe('Stable machine-readable code'),
    message: z.string(),
    fields: z.record(z.string(), z.string()).optional().describe('Message per field path'),
  }),
});
