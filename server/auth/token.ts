import jwt from 'jsonwebtoken';
import { HttpError } from '../http/http-error';
import type { AuthUser } from './auth-user';

/** Signs a sign-in token for `user`, valid for `lifetimeSeconds`. */
export function signToken(user: AuthUser, secret: string, lifetimeSeconds: number): string {
  return jwt.sign({ role: user.role, username: user.username }, secret, {
    algorithm: 'HS256',
    subject: String(user.id),
    expiresIn: lifetimeSeconds,
  });
}

/** Checks a token's signature and expiry; returns the user id or throws a 401. */
export function verifyToken(token: string, secret: string): number {
  let payload: string | jwt.JwtPayload;
  try {
    // Pinning the algorithm keeps "alg: none" and key-confusion tokens out.
    payload = jwt.verify(token, secret, { algorithms: ['HS256'] });
  } catch (error) {
    if (error instanceof jwt.TokenExpiredError) {
      throw new HttpError(401, 'token_expired', 'the sign-in has expired; sign in again');
    }
    throw new HttpError(401, 'invalid_token', 'the sign-in token is not valid');
  }
  const id = typeof payload === 'object' ? Number(payload.sub) : NaN;
  if (!Number.isInteger(id) || id <= 0) {
    throw new HttpError(401, 'invalid_token', 'the sign-in token is not valid');
  }
  return id;
}
