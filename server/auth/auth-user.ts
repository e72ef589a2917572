import type { Role } from './role';

/** A signed-in user as the API shows it. */
export interface AuthUser {
  /** User id. */
  id: number;
  /** Sign-in name. */
  username: string;
  /** Name to show. */
  displayName: string;
  /** What the user may do. */
  role: Role;
}
