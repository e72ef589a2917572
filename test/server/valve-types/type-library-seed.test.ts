import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { VALVE_TYPES } from '../../../shared/catalog/valve-types';
import { startTestHub } from '../test-hub';

describe('type library seed', () => {
  const dir = mkdtempSync(path.join(tmpdir(), 'emberline-seed-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));
  const config = { demo: false, adminPassword: 'seed-test-admin' };

  async function signIn(hub: Awaited<ReturnType<typeof startTestHub>>) {
    const res = await hub.api
      .post('/api/auth/login')
      .send({ username: 'admin', password: config.adminPassword })
      .expect(200);
    return `Bearer ${res.body.token}`;
  }

  it('fills the library outside demo mode too, without demo stock', async () => {
    const hub = await startTestHub(config, dir);
    const admin = await signIn(hub);
    const types = await hub.api.get('/api/valve-types').set('authorization', admin).expect(200);
    expect(types.body.map((t: { designation: string }) => t.designation)).toEqual(
      VALVE_TYPES.map((t) => t.designation),
    );
    const valves = await hub.api.get('/api/valves').set('authorization', admin).expect(200);
    expect(valves.body.total).toBe(0);
    await hub.api.delete('/api/valve-types/300B').set('authorization', admin).expect(204);
    await hub.stop();
  });

  it('fills it once: a type an admin deleted stays deleted after a restart', async () => {
    const hub = await startTestHub(config, dir);
    const admin = await signIn(hub);
    const types = await hub.api.get('/api/valve-types').set('authorization', admin).expect(200);
    expect(types.body).toHaveLength(VALVE_TYPES.length - 1);
    await hub.api.get('/api/valve-types/300B').set('authorization', admin).expect(404);
    await hub.stop();
  });
});
