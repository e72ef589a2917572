import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO_BENCHES } from '../../../server/demo/demo-data';
import { DEMO_STOCK } from '../../../server/demo/demo-stock';
import { startTestHub, type TestHub } from '../test-hub';
import { clearDemoSweeps } from '../demo/clear-demo-sweeps';

type Valve = { id: number; label: string; type: string; status: string; location: string | null };

describe('valve records API', () => {
  let hub: TestHub;
  let admin: string;
  let tech: string;
  let viewer: string;

  beforeAll(async () => {
    hub = await startTestHub();
    // These tests assume stock without sweeps; the demo's sweeps are tested on their own.
    await clearDemoSweeps(hub);
    [admin, tech, viewer] = await Promise.all([
      hub.token('admin'),
      hub.token('tech'),
      hub.token('viewer'),
    ]);
  });
  afterAll(() => hub.close());

  const as = (token: string) => ({
    get: (path: string) => hub.api.get(path).set('authorization', `Bearer ${token}`),
    post: (path: string, body: object) =>
      hub.api.post(path).set('authorization', `Bearer ${token}`).send(body),
    patch: (path: string, body: object) =>
      hub.api.patch(path).set('authorization', `Bearer ${token}`).send(body),
    delete: (path: string) => hub.api.delete(path).set('authorization', `Bearer ${token}`),
  });
  /** The n-th label after the demo stock's, e.g. KL-0033. */
  const demoLabel = (n: number) => `KL-${String(DEMO_STOCK.length + n).padStart(4, '0')}`;
  const list = async (query: string): Promise<{ items: Valve[]; total: number }> =>
    (await as(viewer).get(`/api/valves?${query}`).expect(200)).body;

  it('holds the demo stock, with the bench valves in their sockets', async () => {
    const all = await list('pageSize=100');
    expect(all.total).toBe(DEMO_STOCK.length);
    const count = (type: string) => all.items.filter((v) => v.type === type).length;
    const stock = (type: string) => DEMO_STOCK.filter((v) => v.type === type).length;
    expect([count('12AX7'), count('EL34'), count('12AU7'), count('6L6GC')]).toEqual([
      stock('12AX7'),
      stock('EL34'),
      stock('12AU7'),
      stock('6L6GC'),
    ]);
    expect(stock('EL34')).toBeGreaterThanOrEqual(12);
    for (const bench of DEMO_BENCHES) {
      const v = all.items.find((x) => x.label === bench.label)!;
      expect(v).toMatchObject({ status: 'on-test', location: `${bench.name} socket` });
      expect(v.type).toBe(bench.valve.split('#')[0]);
    }
  });

  it('pages through the list without gaps or repeats', async () => {
    const seen: string[] = [];
    for (let page = 1; page <= Math.ceil(DEMO_STOCK.length / 10); page++) {
      const p = await list(`pageSize=10&page=${page}&sort=label`);
      expect(p.total).toBe(DEMO_STOCK.length);
      seen.push(...p.items.map((v) => v.label));
    }
    expect(seen).toEqual(DEMO_STOCK.map((v) => v.label).sort());
  });

  it('sorts by each key in both directions', async () => {
    for (const [sort, key] of [
      ['label', 'label'],
      ['type', 'type'],
      ['status', 'status'],
      ['location', 'location'],
    ] as const) {
      const asc = (await list(`pageSize=100&sort=${sort}&order=asc`)).items.map((v) => v[key]);
      const desc = (await list(`pageSize=100&sort=${sort}&order=desc`)).items.map((v) => v[key]);
      const expected = [...asc].sort((a, b) =>
        String(a).localeCompare(String(b), 'en', { sensitivity: 'base' }),
      );
      expect(asc, sort).toEqual(expected);
      expect(desc, sort).toEqual([...expected].reverse());
    }
    const v = (await list('pageSize=1&sort=label&order=asc')).items[0];
    await as(tech).patch(`/api/valves/${v.id}`, { notes: 'touched last' }).expect(200);
    const newest = (await list('pageSize=1&sort=updatedAt&order=desc')).items[0];
    expect(newest.id).toBe(v.id);
  });

  it('filters by type (or equivalent), status and location, and combines them', async () => {
    const el34 = await list('type=6CA7&pageSize=100');
    expect(el34.total).toBe(DEMO_STOCK.filter((v) => v.type === 'EL34').length);
    expect(el34.items.every((v) => v.type === 'EL34')).toBe(true);
    const reserved = await list('status=reserved&pageSize=100');
    expect(reserved.items.map((v) => v.label).sort()).toEqual(
      DEMO_STOCK.filter((v) => v.status === 'reserved').map((v) => v.label),
    );
    const drawer = await list(`location=${encodeURIComponent('drawer c3')}&pageSize=100`);
    expect(drawer.total).toBe(DEMO_STOCK.filter((v) => v.location === 'Drawer C3').length);
    const both = await list('type=12AX7&status=in-stock&pageSize=100');
    expect(both.items.every((v) => v.type === '12AX7' && v.status === 'in-stock')).toBe(true);
    expect(both.total).toBe(
      DEMO_STOCK.filter((v) => v.type === '12AX7' && v.status === 'in-stock').length,
    );
    expect((await list('type=NOSUCH')).total).toBe(0);
    expect((await list('grade=ungraded&pageSize=100')).total).toBe(DEMO_STOCK.length);
    await as(viewer).get('/api/valves?status=broken').expect(400);
  });

  it('searches label, maker and notes, treating % and _ literally', async () => {
    const byMaker = await list('q=corrin');
    expect(byMaker.total).toBe(DEMO_STOCK.filter((v) => v.maker === 'Corrin & Hale').length);
    const byLabel = await list('q=kl-0017');
    expect(byLabel.items.map((v) => v.label)).toEqual(['KL-0017']);
    const byNotes = await list(`q=${encodeURIComponent('Bench B socket')}`);
    expect(byNotes.items.map((v) => v.label)).toEqual([DEMO_BENCHES[1].label]);
    expect((await list('q=%25')).total).toBe(0);
  });

  it('generates labels from the workshop prefix and counter, skipping labels in use', async () => {
    const a = await as(tech).post('/api/valves', { type: '12AT7', maker: 'Aurel' }).expect(201);
    expect(a.body).toMatchObject({
      label: demoLabel(1),
      type: '12AT7',
      status: 'in-stock',
      createdBy: 'tech',
    });
    await as(tech)
      .post('/api/valves', { type: 'ECC81', label: demoLabel(2) })
      .expect(201);
    const b = await as(tech).post('/api/valves', { type: '12AT7' }).expect(201);
    expect(b.body.label).toBe(demoLabel(3));
    const taken = await as(tech)
      .post('/api/valves', { type: '12AT7', label: demoLabel(3).toLowerCase() })
      .expect(409);
    expect(taken.body.error).toMatchObject({
      code: 'label_taken',
      fields: { label: 'already in use' },
    });
    const unknown = await as(tech).post('/api/valves', { type: 'QQ1' }).expect(400);
    expect(unknown.body.error.fields).toHaveProperty('type');
    const badLabel = await as(tech).post('/api/valves', { type: '12AT7', label: '../x' });
    expect(badLabel.status).toBe(400);
  });

  it('changes a record and audits who changed what, from and to', async () => {
    const created = await as(tech)
      .post('/api/valves', { type: '6SN7GT', location: 'Drawer A1', originKind: 'supplier' })
      .expect(201);
    const id = created.body.id;
    const changed = await as(tech)
      .patch(`/api/valves/${id}`, { location: 'Drawer A2', status: 'reserved', maker: '' })
      .expect(200);
    expect(changed.body).toMatchObject({ location: 'Drawer A2', status: 'reserved', maker: null });
    expect(changed.body.updatedBy).toBe('tech');
    const audit = await as(admin).get('/api/audit?action=valve.update&pageSize=1').expect(200);
    expect(audit.body.items[0]).toMatchObject({
      username: 'tech',
      subject: `valve:${id}`,
      detail: {
        changes: {
          location: { from: 'Drawer A1', to: 'Drawer A2' },
          status: { from: 'in-stock', to: 'reserved' },
        },
      },
    });
    const retyped = await as(tech).patch(`/api/valves/${id}`, { type: '12AU7' }).expect(200);
    expect(retyped.body.type).toBe('12AU7');
    await as(tech).patch(`/api/valves/${id}`, {}).expect(400);
  });

  it('lets a viewer read but not create, and only an admin delete', async () => {
    const created = await as(tech).post('/api/valves', { type: '300B' }).expect(201);
    const id = created.body.id;
    const denied = await as(viewer).post('/api/valves', { type: '300B' }).expect(403);
    expect(denied.body.error.code).toBe('forbidden');
    await as(viewer).patch(`/api/valves/${id}`, { notes: 'x' }).expect(403);
    await as(tech).delete(`/api/valves/${id}`).expect(403);
    const detail = await as(viewer).get(`/api/valves/${id}`).expect(200);
    expect(detail.body).toMatchObject({ id, type: '300B', sweeps: [], trend: [] });
    expect(detail.body.referencePoint).toEqual({
      vaVolts: 300,
      vg2Volts: null,
      vg1Volts: -61,
      iaMilliamps: 60,
      gmMicrosiemens: 5500,
    });
    await as(admin).delete(`/api/valves/${id}`).expect(204);
    await as(viewer).get(`/api/valves/${id}`).expect(404);
    const audit = await as(admin).get('/api/audit?action=valve.delete&pageSize=1').expect(200);
    expect(audit.body.items[0]).toMatchObject({
      username: 'admin',
      detail: { valve: { label: created.body.label } },
    });
  });
});
