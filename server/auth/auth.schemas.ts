import { z } from 'zod';
import { ROLES } from './role';

/** Body of POST /api/auth/login. */
export const loginBody = z.strictObject({
  username: z.string().min(1).max(64).describe('Sign-in name'),
  password: z.string().min(1).max(200).describe('Password'),
});

/** A user as the API shows it. */
export const authUserSchema = z.object({
  id: z.number().int(),
  username: z.string(),
  displayName: z.string(),
  role: z.enum(ROLES as [string, ...string[]]),
});

/** Answer of POST /api/auth/login. */
export const loginResponse = z.object({
  token: z.string().describe('JWT; send as `Authorization: Bearer <token>`'),
  user: authUserSchema,
});
