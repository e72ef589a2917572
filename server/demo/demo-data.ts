import type { Role } from '../auth/role';

/** The invented workshop the demo data belongs to. */
export const DEMO_WORKSHOP = 'Kestrel Lane Valve Works';

/** Demo sign-ins, seeded in demo mode and printed on start. */
export const DEMO_USERS: readonly {
  username: string;
  password: string;
  role: Role;
  displayName: string;
}[] = [
  { username: 'admin', password: 'ember-admin', role: 'admin', displayName: 'Workshop admin' },
  { username: 'tech', password: 'ember-tech', role: 'technician', displayName: 'Bench technician' },
  { username: 'viewer', password: 'ember-view', role: 'viewer', displayName: 'Visitor' },
];

/**
 * Demo benches with fixed tokens, so the stack can start bridges for them. `valve` is what the
 * simulator of that bench holds (TYPE#SEED); `label` is that valve's record in the demo stock.
 */
export const DEMO_BENCHES: readonly {
  name: string;
  token: string;
  valve: string;
  label: string;
}[] = [
  { name: 'Bench A', token: 'demo-bench-a-7f3c9e', valve: '12AX7#1', label: 'KL-0001' },
  { name: 'Bench B', token: 'demo-bench-b-2d81aa', valve: 'EL34#4', label: 'KL-0009' },
];
