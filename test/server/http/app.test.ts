import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { VALVE_TYPES } from '../../../shared/catalog/valve-types';
import { ROUTES } from '../../../server/route-table';
import { startTestHub, type TestHub } from '../test-hub';

describe('hub app', () => {
  let hub: TestHub;
  let dir: string;
  beforeAll(async () => {
    dir = mkdtempSync(path.join(tmpdir(), 'emberline-static-'));
    writeFileSync(path.join(dir, 'index.html'), '<!doctype html><title>Emberline</title>');
    writeFileSync(path.join(dir, 'main.js'), 'console.log(1)');
    hub = await startTestHub({ staticDir: dir });
  });
  afterAll(async () => {
    await hub.close();
    rmSync(dir, { recursive: true, force: true });
  });

  it('reports health without a sign-in', async () => {
    const res = await fetch(`${hub.url}/api/health`);
    expect(res.status).toBe(200);
    expect(await res.json()).toEqual({ status: 'ok', version: 'test', db: 'ok' });
    expect(res.headers.get('content-security-policy')).toContain("default-src 'self'");
    expect(res.headers.get('content-security-policy')).not.toContain('upgrade-insecure-requests');
  });

  it('serves the app and sends deep links to its index, but not unknown API paths', async () => {
    const js = await fetch(`${hub.url}/main.js`);
    expect(await js.text()).toBe('console.log(1)');
    const deep = await fetch(`${hub.url}/benches/1/sweeps`);
    expect(deep.status).toBe(200);
    expect(await deep.text()).toContain('<title>Emberline</title>');
    const api = await fetch(`${hub.url}/api/nothing`);
    expect(api.status).toBe(404);
    expect(((await api.json()) as { error: { code: string } }).error.code).toBe('route_not_found');
  });

  it('answers malformed JSON with a 400 in the error shape', async () => {
    const res = await hub.api
      .post('/api/auth/login')
      .set('content-type', 'application/json')
      .send('{"username":')
      .expect(400);
    expect(res.body).toEqual({
      error: { code: 'invalid_json', message: 'body is not valid JSON' },
    });
  });

  it('lists the valve type catalogue with a default plan each', async () => {
    const res = await hub.api
      .get('/api/valve-types')
      .set('authorization', `Bearer ${await hub.token('viewer')}`)
      .expect(200);
    expect(res.body.map((t: { designation: string }) => t.designation)).toEqual(
      VALVE_TYPES.map((t) => t.designation),
    );
    const el34 = res.body.find((t: { designation: string }) => t.designation === 'EL34');
    expect(el34).toMatchObject({
      valveClass: 'pentode',
      hasScreen: true,
      hasModel: true,
      ratings: { vaMaxVolts: 800 },
    });
    expect(el34.ratings.source).toBeTruthy();
    expect(el34.defaultPlan).toMatchObject({ kind: 'anode', vg2Volts: 250 });
  });

  it('publishes an OpenAPI 3.1 document of every route with request schemas from zod', async () => {
    const res = await fetch(`${hub.url}/api/openapi.json`);
    // eslint-disable-next-line @typescript-eslint/no-explicit-any -- a JSON document walked freely
    const doc = (await res.json()) as any;
    expect(doc.openapi).toBe('3.1.0');
    const operations = Object.entries(doc.paths).flatMap(([p, ops]) =>
      Object.keys(ops as object).map((m) => `${m.toUpperCase()} ${p}`),
    );
    const expected = Object.keys(ROUTES).map((k) => k.replace(/:(\w+)/g, '{$1}'));
    expect(operations.sort()).toEqual(expected.sort());

    const start = doc.paths['/api/sweeps'].post;
    expect(start['x-min-role']).toBe('technician');
    const body = start.requestBody.content['application/json'].schema;
    expect(body.required).toEqual(expect.arrayContaining(['benchId', 'plan']));
    expect(body.properties.plan.properties.vaStopVolts).toMatchObject({ type: 'number' });
    expect(body.properties.plan.additionalProperties).toBe(false);
    const list = doc.paths['/api/sweeps'].get.parameters.map((p: { name: string }) => p.name);
    expect(list).toEqual(
      expect.arrayContaining(['page', 'pageSize', 'sort', 'order', 'status', 'benchId', 'q']),
    );
    const sort = doc.paths['/api/sweeps'].get.parameters.find(
      (p: { name: string }) => p.name === 'sort',
    );
    expect(sort.schema.enum).toEqual(['createdAt', 'status', 'valveType', 'pointCount']);
    expect(doc.paths['/api/sweeps/{id}'].get.parameters[0]).toMatchObject({
      name: 'id',
      in: 'path',
      required: true,
    });
    expect(doc.paths['/api/health'].get.security).toEqual([]);
    expect(doc.components.securitySchemes.bearerAuth.scheme).toBe('bearer');
  });
});
