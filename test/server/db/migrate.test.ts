import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { sql } from 'kysely';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { openDatabase, type HubDb } from '../../../server/db/database';
import { migrateToLatest } from '../../../server/db/migrate';

describe('database migrations', () => {
  let dir: string;
  let db: HubDb;

  beforeEach(() => {
    dir = mkdtempSync(path.join(tmpdir(), 'emberline-migrate-'));
    db = openDatabase(path.join(dir, 'hub.sqlite'));
  });
  afterEach(async () => {
    await db.destroy();
    rmSync(dir, { recursive: true, force: true });
  });

  it('creates every table on a fresh file and is a no-op the second time', async () => {
    const first = await migrateToLatest(db);
    const ran = first.results?.map((r) => [r.migrationName, r.status]) ?? [];
    // Other features add migrations of their own: these must be among them, in name order.
    expect(ran.map(([name]) => name)).toEqual(ran.map(([name]) => name).sort());
    expect(ran.every(([, status]) => status === 'Success')).toBe(true);
    expect(ran.slice(0, 4)).toEqual([
      ['2026-12-01-initial', 'Success'],
      ['2026-12-02-type-library', 'Success'],
      ['2026-12-02-type-library-seed', 'Success'],
      ['2026-12-03-valve-records', 'Success'],
    ]);
    const tables = (await db.introspection.getTables()).map((t) => t.name).sort();
    expect(tables).toEqual(
      expect.arrayContaining([
        'attachments',
        'audit_log',
        'benches',
        'nominal_curve_sets',
        'nominal_points',
        'sweep_figures',
        'sweep_points',
        'sweeps',
        'type_operating_points',
        'type_ratings',
        'users',
        'valve_types',
        'valves',
        'workshop_settings',
      ]),
    );
    const again = await migrateToLatest(db);
    expect(again.results).toEqual([]);
  });

  it("fills a graded quick test's percentage from its stored part results", async () => {
    await migrateToLatest(db, '2026-12-05-match-sets');
    const results = [
      { part: 'gm', status: 'done', result: { part: 'gm', gmPercent: 72.5, iaPercent: 88 } },
      { part: 'emission', status: 'done', result: { part: 'emission', percent: 91 } },
      { part: 'leakage', status: 'done', result: { part: 'leakage', pairs: [] } },
    ];
    await sql`pragma foreign_keys = off`.execute(db);
    for (const [status, json] of [
      ['complete', JSON.stringify(results)],
      ['complete', JSON.stringify(results.slice(2))],
      ['aborted', JSON.stringify(results)],
    ]) {
      await sql`insert into quick_tests (bench_id, valve_type, parts_json, plan_json,
        results_json, thresholds_json, operator_id, status, created_at)
        values (1, '12AX7', '[]', '{}', ${json}, '{}', 1, ${status}, '2026-12-01')`.execute(db);
    }
    await migrateToLatest(db);
    const rows = await sql<{ grade_percent: number | null }>`
      select grade_percent from quick_tests order by id`.execute(db);
    // The lower of gm and emission; none without either; none for a test that did not complete.
    expect(rows.rows.map((r) => r.grade_percent)).toEqual([72.5, null, null]);
  });

  it('opens the file in WAL mode with foreign keys on and full fsync', async () => {
    const mode = await sql<{ journal_mode: string }>`pragma journal_mode`.execute(db);
    const fk = await sql<{ foreign_keys: number }>`pragma foreign_keys`.execute(db);
    const sync = await sql<{ synchronous: number }>`pragma synchronous`.execute(db);
    expect(mode.rows[0].journal_mode).toBe('wal');
    expect(fk.rows[0].foreign_keys).toBe(1);
    expect(sync.rows[0].synchronous).toBe(2); // FULL
  });

  it('stores sweep points without a rowid, keyed by sweep and seq', async () => {
    await migrateToLatest(db);
    const ddl = await sql<{
      sql: string;
    }>`select sql from sqlite_master where name = 'sweep_points'`.execute(db);
    expect(ddl.rows[0].sql.toLowerCase()).toContain('without rowid');
    expect(ddl.rows[0].sql.toLowerCase()).toMatch(/primary key \("sweep_id", "seq"\)/);
  });

  it('refuses a second unfinished sweep on the same bench', async () => {
    await migrateToLatest(db);
    const now = new Date().toISOString();
    const user = await db
      .insertInto('users')
      .values({
        username: 'u',
        display_name: 'U',
        password_hash: 'x',
        role: 'admin',
        created_at: now,
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    const bench = await db
      .insertInto('benches')
      .values({
        name: 'B',
        token_hash: 'h',
        va_max_volts: 1,
        vg2_max_volts: 1,
        ia_max_milliamps: 1,
        pa_max_watts: 1,
        capabilities_json: null,
        last_seen_at: null,
        created_at: now,
      })
      .returning('id')
      .executeTakeFirstOrThrow();
    const sweep = (status: 'pending' | 'running' | 'complete') =>
      db
        .insertInto('sweeps')
        .values({
          bench_id: bench.id,
          valve_type: null,
          valve_label: null,
          plan_json: '{}',
          operator_id: user.id,
          status,
          end_reason: null,
          end_message: null,
          override_by: null,
          reported_count: null,
          created_at: now,
          started_at: null,
          ended_at: null,
        })
        .execute();
    await sweep('complete');
    await sweep('complete');
    await sweep('running');
    await expect(sweep('pending')).rejects.toThrow(/UNIQUE/);
  });

  it('runs as a script, and exits non-zero when a migration fails', async () => {
    const tsx = path.resolve('node_modules/.bin/tsx');
    const run = (file: string) =>
      spawnSync(tsx, ['server/db/migrate.ts'], {
        env: { ...process.env, DATA_DIR: dir, DB_FILE: file, JWT_SECRET: 'x' },
        encoding: 'utf8',
      });
    const ok = run(path.join(dir, 'fresh.sqlite'));
    expect(ok.status).toBe(0);
    expect(ok.stdout).toContain('Success: 2026-12-01-initial');

    // A table the first migration wants to create is already there: that migration fails.
    const clashing = path.join(dir, 'clashing.sqlite');
    const other = openDatabase(clashing);
    await sql`create table users (id integer)`.execute(other);
    await other.destroy();
    const bad = run(clashing);
    expect(bad.status).not.toBe(0);
    expect(bad.stderr).toContain('migration 2026-12-01-initial failed');
  });
});
