import { mkdtempSync, readFileSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { loadConfig } from '../../server/config';
import { startTestHub } from './test-hub';

describe('hub configuration', () => {
  let dir: string;
  beforeEach(() => {
    dir = mkdtempSync(path.join(tmpdir(), 'emberline-config-'));
  });
  afterEach(() => rmSync(dir, { recursive: true, force: true }));

  it('falls back to safe defaults', () => {
    const c = loadConfig({ DATA_DIR: dir });
    expect(c).toMatchObject({
      port: 4300,
      host: '127.0.0.1',
      dataDir: dir,
      databaseFile: path.join(dir, 'emberline.sqlite'),
      jwtLifetimeSeconds: 12 * 3600,
      demo: true,
      staticDir: path.resolve('dist/emberline/browser'),
      linkGraceMs: 30_000,
      pingIntervalMs: 10_000,
    });
  });

  it('generates the JWT secret once, private to the owner, and reuses it', () => {
    const first = loadConfig({ DATA_DIR: dir }).jwtSecret;
    expect(first).toMatch(/^[0-9a-f]{64}$/);
    expect(loadConfig({ DATA_DIR: dir }).jwtSecret).toBe(first);
    const file = path.join(dir, 'jwt-secret');
    expect(readFileSync(file, 'utf8').trim()).toBe(first);
    expect(statSync(file).mode & 0o077).toBe(0);
    expect(loadConfig({ DATA_DIR: dir, JWT_SECRET: 'from-env' }).jwtSecret).toBe('from-env');
  });

  it('reads the environment and refuses nonsense', () => {
    const c = loadConfig({
      DATA_DIR: dir,
      PORT: '0',
      DEMO: '0',
      LINK_GRACE_SECONDS: '2.5',
      JWT_LIFETIME_HOURS: '1',
    });
    expect(c).toMatchObject({ port: 0, demo: false, linkGraceMs: 2500, jwtLifetimeSeconds: 3600 });
    expect(() => loadConfig({ DATA_DIR: dir, PORT: 'http' })).toThrow(/PORT/);
    expect(() => loadConfig({ DATA_DIR: dir, LINK_GRACE_SECONDS: '-1' })).toThrow(
      /LINK_GRACE_SECONDS/,
    );
  });

  it('outside demo mode creates only an admin with the given password', async () => {
    const hub = await startTestHub({ demo: false, adminPassword: 'first-admin-pw' });
    const ok = await hub.api
      .post('/api/auth/login')
      .send({ username: 'admin', password: 'first-admin-pw' });
    expect(ok.status).toBe(200);
    const demo = await hub.api
      .post('/api/auth/login')
      .send({ username: 'tech', password: 'ember-tech' });
    expect(demo.status).toBe(401);
    const benches = await hub.api
      .get('/api/benches')
      .set('authorization', `Bearer ${ok.body.token}`);
    expect(benches.body).toEqual([]);
    await hub.close();
  });
});
