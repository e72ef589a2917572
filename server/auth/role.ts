/** User roles, from most to least trusted: admin > technician > viewer. */
export type Role = 'admin' | 'technician' | 'viewer';

/** Every role, most trusted first. */
export const ROLES: readonly Role[] = ['admin', 'technician', 'viewer'];

const RANK: Record<Role, number> = { viewer: 0, technician: 1, admin: 2 };

/** Whether a user with `role` may do what needs at least `minimum`. */
export function roleAtLeast(role: Role, minimum: Role): boolean {
  return RANK[role] >= RANK[minimum];
}
