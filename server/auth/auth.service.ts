import type { Request } from 'express';
import type { AuditService } from '../audit/audit.service';
import type { HubDb, UserRow } from '../db/database';
import { HttpError } from '../http/http-error';
import type { AuthUser } from './auth-user';
import { dummyHash, verifyPassword } from './password';
import { signToken, verifyToken } from './token';
import { findUserById, findUserByUsername } from './user.repository';

/** Props of the auth service. */
export interface AuthServiceProps {
  db: HubDb;
  audit: AuditService;
  /** HMAC secret of the JWTs. */
  jwtSecret: string;
  /** Lifetime of a sign-in, s. */
  jwtLifetimeSeconds: number;
}

/** Sign-in and token checks. */
export type AuthService = ReturnType<typeof createAuthService>;

/** Maps a user row to the API shape (never the password hash). */
export function toAuthUser(row: UserRow): AuthUser {
  return { id: row.id, username: row.username, displayName: row.display_name, role: row.role };
}

/** Builds the auth service. */
export function createAuthService({ db, audit, jwtSecret, jwtLifetimeSeconds }: AuthServiceProps) {
  /** The user a token belongs to; throws a 401 if the token is bad or the user is gone. */
  async function userFromToken(token: string): Promise<AuthUser> {
    const id = verifyToken(token, jwtSecret);
    const row = await findUserById(db, id);
    if (!row) throw new HttpError(401, 'invalid_token', 'the sign-in token is not valid');
    return toAuthUser(row);
  }

  return {
    /** Checks a password; same answer for an unknown user and a wrong password. */
    async login(username: string, password: string): Promise<{ token: string; user: AuthUser }> {
      const row = await findUserByUsername(db, username);
      // Compare against a dummy hash for unknown users so timing does not reveal who exists.
      const ok = await verifyPassword(password, row?.password_hash ?? dummyHash());
      if (!row || !ok) {
        await audit.record(null, 'auth.login-failed', username, null);
        throw new HttpError(401, 'bad_credentials', 'wrong user name or password');
      }
      const user = toAuthUser(row);
      await audit.record(user, 'auth.login', `user:${user.id}`, null);
      return { token: signToken(user, jwtSecret, jwtLifetimeSeconds), user };
    },

    userFromToken,

    /** The user of a request's `Authorization: Bearer` header; throws a 401 without one. */
    async authenticate(req: Request): Promise<AuthUser> {
      const header = req.headers.authorization ?? '';
      const match = /^Bearer\s+(\S+)$/i.exec(header);
      if (!match) throw new HttpError(401, 'unauthenticated', 'sign in first');
      return userFromToken(match[1]);
    },
  };
}
