import { randomBytes } from 'node:crypto';
import { hashPassword } from '../auth/password';
import { countUsers, insertUser } from '../auth/user.repository';
import { hashBenchToken } from '../benches/bench-token';
import { countBenches, insertBench } from '../benches/bench.repository';
import { DEFAULT_BENCH_LIMITS } from '../benches/bench.service';
import type { HubDb } from '../db/database';
import type { Logger } from '../http/error-middleware';
import { DEMO_BENCHES, DEMO_USERS, DEMO_WORKSHOP } from './demo-data';
import { seedDemoStock } from './seed-demo-stock';
import { seedDemoSweeps } from './seed-demo-sweeps';

/**
 * Seeds demo users, benches and valve stock into whichever of those tables is empty; new demo
 * stock comes with a sweep for each valve the simulator can model.
 */
export async function seedDemo(db: HubDb, logger: Logger): Promise<void> {
  const now = new Date().toISOString();
  if ((await countUsers(db)) === 0) {
    for (const u of DEMO_USERS) {
      await insertUser(db, {
        username: u.username,
        display_name: u.displayName,
        password_hash: await hashPassword(u.password),
        role: u.role,
        created_at: now,
      });
    }
    logger.info(`demo users of ${DEMO_WORKSHOP} created`);
  }
  if ((await countBenches(db)) === 0) {
    for (const b of DEMO_BENCHES) {
      await insertBench(db, {
        name: b.name,
        token_hash: hashBenchToken(b.token),
        va_max_volts: DEFAULT_BENCH_LIMITS.vaMaxVolts,
        vg2_max_volts: DEFAULT_BENCH_LIMITS.vg2MaxVolts,
        ia_max_milliamps: DEFAULT_BENCH_LIMITS.iaMaxMilliamps,
        pa_max_watts: DEFAULT_BENCH_LIMITS.paMaxWatts,
        capabilities_json: null,
        last_seen_at: null,
        created_at: now,
      });
    }
    logger.info('demo benches created');
  }
  if ((await seedDemoStock(db, logger)) > 0) {
    const sweeps = await seedDemoSweeps(db);
    logger.info(`demo sweeps created (${sweeps})`);
  }
}

/**
 * Outside demo mode, a hub with no users gets one admin, with ADMIN_PASSWORD or a generated
 * password that is logged once. Returns the password when it created the admin.
 */
export async function ensureAdmin(
  db: HubDb,
  password: string | null,
  logger: Logger,
): Promise<string | null> {
  if ((await countUsers(db)) > 0) return null;
  const chosen = password ?? randomBytes(12).toString('base64url');
  await insertUser(db, {
    username: 'admin',
    display_name: 'Administrator',
    password_hash: await hashPassword(chosen),
    role: 'admin',
    created_at: new Date().toISOString(),
  });
  logger.warn(
    password
      ? 'created user admin with ADMIN_PASSWORD'
      : `created user admin with password ${chosen} (shown once; change it)`,
  );
  return chosen;
}
