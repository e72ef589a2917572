import type { Role } from '../core/auth';

/** An entry of the side navigation. */
export interface NavItem {
  path: string;
  label: string;
  icon: string;
  /** Roles that see the entry. */
  roles: readonly Role[];
}

const EVERYONE: readonly Role[] = ['admin', 'technician', 'viewer'];

/** The side navigation; entries a role may not use are not shown to it at all. */
export const NAV_ITEMS: readonly NavItem[] = [
  { path: '/bench', label: 'Bench', icon: 'monitoring', roles: EVERYONE },
  { path: '/sweeps', label: 'Sweeps', icon: 'table_rows', roles: EVERYONE },
  { path: '/valves', label: 'Valves', icon: 'inventory_2', roles: EVERYONE },
  { path: '/box-check', label: 'Box check', icon: 'check_circle', roles: ['admin', 'technician'] },
  { path: '/matching', label: 'Matching', icon: 'compare_arrows', roles: ['admin', 'technician'] },
  { path: '/match-sets', label: 'Match sets', icon: 'sell', roles: EVERYONE },
  { path: '/types', label: 'Types', icon: 'category', roles: EVERYONE },
  { path: '/outbox', label: 'Outbox', icon: 'outbox', roles: ['admin'] },
  { path: '/settings', label: 'Settings', icon: 'settings', roles: ['admin'] },
];
