import type { z } from 'zod';
import { HttpError } from './http-error';

/**
 * Parses `value` with `schema` or throws a 400 naming every bad field by its dotted path
 * (`plan.vaStopVolts`, `vg1Volts.2`). `what` says which part of the request it was.
 */
export function validate<S extends z.ZodType>(
  schema: S,
  value: unknown,
  what: 'body' | 'query' | 'path' | 'message' = 'body',
): z.output<S> {
  const result = schema.safeParse(value);
  if (result.success) return result.data;
  const fields: Record<string, string> = {};
  for (const issue of result.error.issues) {
    const key = issue.path.map(String).join('.') || what;
    fields[key] = fields[key] ? `${fields[key]}; ${issue.message}` : issue.message;
  }
  const first = Object.entries(fields)[0];
  throw new HttpError(
    400,
    'validation_failed',
    `invalid ${what}: ${first[0]}: ${first[1]}`,
    fields,
  );
}
