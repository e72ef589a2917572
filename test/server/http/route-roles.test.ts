import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ROLES, roleAtLeast, type Role } from '../../../server/auth/role';
import { splitRouteKey } from '../../../server/http/route-spec';
import { ROUTES } from '../../../server/route-table';
import { startTestHub, type TestHub } from '../test-hub';

const USER_OF: Record<Role, 'admin' | 'tech' | 'viewer'> = {
  admin: 'admin',
  technician: 'tech',
  viewer: 'viewer',
};

const entries = Object.entries(ROUTES).map(([key, spec]) => {
  const [method, path] = splitRouteKey(key as keyof typeof ROUTES);
  return { key, method, path: path.replace(/:id/g, '999'), minRole: spec.minRole as Role | null };
});

describe('route x role matrix', () => {
  let hub: TestHub;
  beforeAll(async () => {
    hub = await startTestHub();
  });
  afterAll(() => hub.close());

  const call = (method: string, path: string, token?: string) => {
    const r = hub.api[method as 'get'](path);
    if (token) r.set('authorization', `Bearer ${token}`);
    return method === 'get' ? r : r.send({});
  };

  it('has a row for every route the API serves, and only for mounted routes', async () => {
    const admin = await hub.token('admin');
    for (const e of entries) {
      const res = await call(e.method, e.path, admin);
      expect(res.body?.error?.code, e.key).not.toBe('route_not_found');
    }
    const missing = await call('get', '/api/no-such-thing', admin);
    expect(missing.status).toBe(404);
    expect(missing.body.error.code).toBe('route_not_found');
  });

  for (const e of entries.filter((x) => x.minRole !== null)) {
    it(`${e.key} needs a sign-in`, async () => {
      const res = await call(e.method, e.path);
      expect(res.status).toBe(401);
      expect(res.body.error.code).toBe('unauthenticated');
    });

    for (const role of ROLES) {
      const allowed = roleAtLeast(role, e.minRole!);
      it(`${e.key} is ${allowed ? 'open' : 'closed'} to a ${role}`, async () => {
        const res = await call(e.method, e.path, await hub.token(USER_OF[role]));
        if (allowed) {
          expect([401, 403]).not.toContain(res.status);
        } else {
          expect(res.status).toBe(403);
          expect(res.body.error.code).toBe('forbidden');
        }
      });
    }
  }

  for (const e of entries.filter((x) => x.minRole === null)) {
    it(`${e.key} is open without a sign-in`, async () => {
      const res = await call(e.method, e.path);
      expect([401, 403]).not.toContain(res.status);
    });
  }

  it('keeps the agreed least roles of the sensitive routes', () => {
    expect(ROUTES['POST /api/sweeps'].minRole).toBe('technician');
    expect(ROUTES['POST /api/sweeps/:id/abort'].minRole).toBe('technician');
    expect(ROUTES['POST /api/benches'].minRole).toBe('admin');
    expect(ROUTES['PATCH /api/benches/:id'].minRole).toBe('admin');
    expect(ROUTES['GET /api/audit'].minRole).toBe('admin');
  });
});
