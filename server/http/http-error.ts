/** An error that becomes a `{ error: { code, message, fields? } }` response with `status`. */
export class HttpError extends Error {
  constructor(
    /** HTTP status, 4xx for the caller's mistakes. */
    readonly status: number,
    /** Stable machine-readable code, snake_case. */
    readonly code: string,
    message: string,
    /** Per-field messages, keyed by the field's dotted path (e.g. `plan.vaStopVolts`). */
    readonly fields?: Record<string, string>,
  ) {
    super(message);
    this.name = 'HttpError';
  }
}

/** A 404 for an entity that does not exist, e.g. `notFound('sweep', 12)`. */
export function notFound(entity: string, id: number | string): HttpError {
  return new HttpError(404, `${entity}_not_found`, `${entity} ${id} does not exist`);
}
