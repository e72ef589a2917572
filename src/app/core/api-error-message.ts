import { HttpErrorResponse } from '@angular/common/http';

/** Error body of the hub: `{ error: { code, message, fields? } }`. */
export interface ApiErrorBody {
  error: { code: string; message: string; fields?: Record<string, string> };
}

/** The hub's error body of a failed request, or null if it sent none. */
export function apiErrorBody(err: unknown): ApiErrorBody['error'] | null {
  if (!(err instanceof HttpErrorResponse)) return null;
  const body = err.error as Partial<ApiErrorBody> | null;
  return body && typeof body === 'object' && body.error && typeof body.error.message === 'string'
    ? body.error
    : null;
}

/** A sentence for the user about a failed request. */
export function apiErrorMessage(err: unknown, fallback = 'Something went wrong.'): string {
  if (err instanceof HttpErrorResponse && err.status === 0) {
    return 'The hub cannot be reached. Check that Emberline is running.';
  }
  return apiErrorBody(err)?.message ?? fallback;
}
