import type { TestHub } from '../test-hub';

/** Deletes the demo sweeps (and their points and figures), for tests that plant their own. */
export async function clearDemoSweeps(hub: TestHub): Promise<void> {
  const db = hub.services.db;
  await db.deleteFrom('sweep_figures').execute();
  await db.deleteFrom('sweep_points').execute();
  await db.deleteFrom('sweeps').execute();
}
