import type { Request, RequestHandler } from 'express';
import { HttpError } from '../http/http-error';
import type { AuthUser } from './auth-user';
import { roleAtLeast, type Role } from './role';

/** Resolves the signed-in user of a request or throws a 401. */
export type Authenticate = (req: Request) => Promise<AuthUser>;

/**
 * Middleware that lets through only users with at least `minimum`; 401 without a valid
 * sign-in, 403 with too low a role. The user is left in `res.locals.user`.
 */
export function requireRole(minimum: Role, authenticate: Authenticate): RequestHandler {
  return async (req, res, next) => {
    const user = await authenticate(req);
    if (!roleAtLeast(user.role, minimum)) {
      throw new HttpError(403, 'forbidden', `this needs the ${minimum} role or higher`);
    }
    res.locals.user = user;
    next();
  };
}
