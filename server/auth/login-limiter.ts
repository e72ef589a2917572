import type { RequestHandler } from 'express';
import { ipKeyGenerator, rateLimit } from 'express-rate-limit';

/** Failed sign-ins one address may make for one user name in a window. */
export const LOGIN_FAILURES_PER_USER = 10;
/** Failed sign-ins one address may make in a window, over all user names. */
export const LOGIN_FAILURES_PER_ADDRESS = 50;
/** The window, ms. */
export const LOGIN_WINDOW_MS = 15 * 60_000;

/**
 * Slows guessing of passwords on POST /api/auth/login: only failed attempts count (a workshop
 * signing in all day is never held up), by address and user name, and by address alone; past
 * either limit the hub answers 429 with Retry-After until the window has passed. Counts are kept
 * in memory: a restart forgets them, which bcrypt's cost per attempt makes acceptable.
 */
export function loginLimiters(): RequestHandler[] {
  const refuse = (what: string) => ({
    error: {
      code: 'too_many_attempts',
      message: `too many failed sign-ins ${what}; wait ${LOGIN_WINDOW_MS / 60_000} minutes`,
    },
  });
  return [
    rateLimit({
      windowMs: LOGIN_WINDOW_MS,
      limit: LOGIN_FAILURES_PER_ADDRESS,
      skipSuccessfulRequests: true,
      standardHeaders: 'draft-7',
      legacyHeaders: false,
      keyGenerator: (req) => ipKeyGenerator(req.ip ?? ''),
      message: refuse('from this address'),
    }),
    rateLimit({
      windowMs: LOGIN_WINDOW_MS,
      limit: LOGIN_FAILURES_PER_USER,
      skipSuccessfulRequests: true,
      standardHeaders: 'draft-7',
      legacyHeaders: false,
      keyGenerator: (req) => {
        const body = req.body as { username?: unknown } | undefined;
        const name = typeof body?.username === 'string' ? body.username.trim().toLowerCase() : '';
        return `${ipKeyGenerator(req.ip ?? '')}|${name}`;
      },
      message: refuse('for this user name'),
    }),
  ];
}
