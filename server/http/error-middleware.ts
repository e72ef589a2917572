import type { ErrorRequestHandler, RequestHandler } from 'express';
import { HttpError } from './http-error';

/** Minimal logger the hub writes to; console by default, silent in tests. */
export interface Logger {
  info(message: string): void;
  warn(message: string): void;
  error(message: string, error?: unknown): void;
}

/** Answers any /api path no route matched. */
export const apiNotFound: RequestHandler = (req) => {
  throw new HttpError(404, 'route_not_found', `no route for ${req.method} ${req.path}`);
};

/**
 * The one place errors become responses: `{ error: { code, message, fields? } }`. Known errors
 * keep their 4xx status; anything else is logged and answered 500 without internals.
 */
export function errorMiddleware(logger: Logger): ErrorRequestHandler {
  return (error: unknown, _req, res, next) => {
    if (res.headersSent) return next(error);
    const http = toHttpError(error);
    if (http.status >= 500) logger.error('request failed', error);
    const body: { code: string; message: string; fields?: Record<string, string> } = {
      code: http.code,
      message: http.message,
    };
    if (http.fields) body.fields = http.fields;
    res.status(http.status).json({ error: body });
  };
}

function toHttpError(error: unknown): HttpError {
  if (error instanceof HttpError) return error;
  // body-parser marks its own errors with `type` and a 4xx `status`.
  const e = error as { type?: string; status?: number; message?: string };
  if (e?.type === 'entity.parse.failed')
    return new HttpError(400, 'invalid_json', 'body is not valid JSON');
  if (e?.type === 'entity.too.large')
    return new HttpError(413, 'body_too_large', 'body is too large');
  if (typeof e?.status === 'number' && e.status >= 400 && e.status < 500) {
    return new HttpError(e.status, 'bad_request', e.message ?? 'bad request');
  }
  return new HttpError(500, 'internal', 'internal error');
}
